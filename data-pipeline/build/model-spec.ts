/**
 * Which screening model a build runs, as plain data (so worker threads can build their own copy):
 * the full per-cell model for a scenario (layers/screening/cell-screening-model.ts) or the basic
 * TTOP + Stefan model (layers/screening/basic-screening-model.ts).
 */
import {
  createBasicScreeningModel,
  type BasicScreeningOptions,
} from '../../layers/screening/basic-screening-model';
import { createScreeningModel } from '../../layers/screening/cell-screening-model';
import type { ScreeningModel } from '../../layers/screening/screening-model';

export type ModelSpec =
  { kind: 'screening'; scenario: unknown } | { kind: 'basic'; options?: BasicScreeningOptions };

export function createModelFromSpec(spec: ModelSpec): ScreeningModel {
  return spec.kind === 'basic'
    ? createBasicScreeningModel(spec.options)
    : createScreeningModel(spec.scenario);
}
