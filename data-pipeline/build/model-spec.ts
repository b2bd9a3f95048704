/**
 * Which screening model a build runs, as plain data (so worker threads can build their own copy):
 * the full per-cell model for a scenario (layers/screening/cell-screening-model.ts), its per-cell
 * ensemble (layers/screening/cell-ensemble-model.ts) or the basic TTOP + Stefan model
 * (layers/screening/basic-screening-model.ts).
 */
import {
  createBasicScreeningModel,
  type BasicScreeningOptions,
} from '../../layers/screening/basic-screening-model';
import { createScreeningModel } from '../../layers/screening/cell-screening-model';
import type { ScreeningModel } from '../../layers/screening/screening-model';
import { createEnsembleModel } from '../../layers/screening/cell-ensemble-model';
import type { GridSpread, SpreadRole } from '../../layers/screening/uncertainty-schema';

export type ModelSpec =
  | { kind: 'screening'; scenario: unknown }
  | { kind: 'basic'; options?: BasicScreeningOptions }
  | {
      kind: 'ensemble';
      /** Scenario with its `uncertainty` (cell-ensemble-model.ts). */
      scenario: unknown;
      /** Spreads the inputs config declares per grid role. */
      gridSpreads?: Partial<Record<SpreadRole, GridSpread>>;
      /** Roles with a companion standard-deviation grid (sd-grids.ts). */
      gridSdRoles?: SpreadRole[];
    };

export function createModelFromSpec(spec: ModelSpec): ScreeningModel {
  if (spec.kind === 'basic') return createBasicScreeningModel(spec.options);
  if (spec.kind === 'ensemble')
    return createEnsembleModel({
      scenario: spec.scenario,
      gridSpreads: spec.gridSpreads,
      gridSdRoles: spec.gridSdRoles,
    });
  return createScreeningModel(spec.scenario);
}
