/**
 * Worker thread of the build: builds its own model from the ModelSpec, then screens the row windows
 * the main thread posts, writing each window's rows into the band files at their offsets (windows never
 * overlap) and answering with the window's statistics; `{ close: true }` closes the input files it opened
 * (answered with `{ closed: true }`).
 */
import { parentPort, workerData } from 'node:worker_threads';
import type { GridRoleId } from '../inputs-config';
import type { AnalysisGrid } from './analysis-grid';
import type { BandFiles } from './band-files';
import { createModelFromSpec, type ModelSpec } from './model-spec';
import { createWindowScreener, type WindowInput } from './screen-window';

export interface ScreenWorkerData {
  spec: ModelSpec;
  grid: AnalysisGrid;
  inputs: WindowInput[];
  echoRoles: GridRoleId[];
  files: BandFiles;
}

const data = workerData as ScreenWorkerData;
const screener = createWindowScreener({ ...data, model: createModelFromSpec(data.spec) });

parentPort?.on('message', async (msg: { row0: number; row1: number; close?: boolean }) => {
  if (msg.close) {
    // Close the input files before the main thread terminates this worker.
    await screener.close().catch(() => undefined);
    parentPort?.postMessage({ closed: true });
    return;
  }
  try {
    const stats = await screener.screen(msg.row0, msg.row1);
    parentPort?.postMessage({ row0: msg.row0, row1: msg.row1, stats });
  } catch (err) {
    parentPort?.postMessage({ error: (err as Error).stack ?? String(err) });
  }
});
