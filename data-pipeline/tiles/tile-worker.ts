/**
 * Tile worker thread: renders whole subtrees of the pyramid (writing their tiles) from the
 * analysis-grid band files, and returns each subtree root's planes so the main thread can build the levels
 * above from them.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { createTileRenderer, type TileRendererOptions } from './write-tile-pyramid';

let finest = 0;
const renderer = createTileRenderer({ ...(workerData as TileRendererOptions), onFinest: () => finest++ });

parentPort?.on('message', async (msg: { z: number; x: number; y: number }) => {
  try {
    const before = { ...renderer.written };
    finest = 0;
    const planes = await renderer.render(msg.z, msg.x, msg.y);
    const written: Record<number, number> = {};
    for (const [z, c] of Object.entries(renderer.written)) written[Number(z)] = c - (before[Number(z)] ?? 0);
    const transfer = planes ? planes.map((p) => p.buffer as ArrayBuffer) : [];
    parentPort?.postMessage({ key: `${msg.x}/${msg.y}`, planes, written, finest }, transfer);
  } catch (err) {
    parentPort?.postMessage({ error: (err as Error).stack ?? String(err) });
  }
});
