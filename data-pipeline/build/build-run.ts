/**
 * What one build (build-tiles.ts) hands from stage to stage: the resolved models, the loaded inputs and
 * the analysis grid (BuildRun), and each scenario's screened output before its manifest is written
 * (ScenarioOutput). Screening and tiling are in screen-scenario.ts, the manifests in write-manifests.ts.
 */
import type { Manifest } from '../../layers/screening/manifest';
import type { Scenario } from '../../layers/screening/scenario';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import type { InputsConfig } from '../inputs-config';
import type { AnalysisGrid } from './analysis-grid';
import type { BuildOptions } from './build-tiles';
import type { ScenarioComparison } from './compare-scenarios';
import type { ComputeResult } from './compute-layers';
import type { FaultStage } from './fault-points';
import type { InputReader, LoadedInput, LoadedInputs } from './load-inputs';
import type { ModelSpec } from './model-spec';

export interface ResolvedModel {
  model: ScreeningModel;
  spec?: ModelSpec;
  name: string;
  /** The parsed scenario (screening model only). */
  scenario?: Scenario;
}

/** The build's settings, known before its inputs are read. */
export interface BuildSetup {
  options: BuildOptions;
  /** Date.now() when the build began. */
  started: number;
  cellSize_m: number;
  reader: InputReader;
  models: ResolvedModel[];
  progress: (stage: string, done: number, total: number) => void;
}

/** A build once its inputs are read and its analysis grid is fixed. */
export interface BuildRun extends BuildSetup {
  config: InputsConfig;
  inputs: LoadedInput[];
  geojson: LoadedInputs['geojson'];
  grid: AnalysisGrid;
  threads: number;
  /** Enter a stage: remembered for the disk-full message, and a fault point for tests (fault-points.ts). */
  enter: (next: FaultStage, target: string) => Promise<void>;
}

/** One scenario's screened output, before its manifest is written. */
export interface ScenarioOutput {
  resolved: ResolvedModel;
  dir: string;
  slug: string;
  /** Directory from the build's root: '' for the first scenario, else scenarios/<slug>/. */
  sub: string;
  result: ComputeResult;
  bands: Manifest['bands'];
  bounds: [number, number, number, number];
  minZoom: number;
  maxZoom: number;
  tilesByZoom: Record<number, number>;
  tiles: number;
  shares: Record<string, Record<string, number>>;
  geotiffs?: Record<string, string>;
  /** Against the first scenario (null for the first). */
  comparison: ScenarioComparison | null;
}
