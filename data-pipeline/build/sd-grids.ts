/**
 * Companion spread grids (issue 14 item 1). An inputs-config grid entry may name a second raster that
 * holds the spread of that input cell by cell:
 * - `sdFile` (continuous grids): the standard deviation, in the entry's own `unit`, converted with the
 *   linear part of the unit conversion (a standard deviation in K is one in °C; one in percent is a
 *   hundredth of one in m³/m³); every value must be finite and lie in [0, span of the role's plausible
 *   range];
 * - `confusionFile` (class grids): the probability that the cell's class is wrong, a fraction that must
 *   be finite and lie in [0, 1].
 * Either is read exactly like the input (load-inputs.ts: GDAL, the file's scale and offset, nodata) and
 * warped onto the analysis grid with the input's own method (align-inputs.ts: bilinear for a
 * continuous input, nearest neighbour for a class grid, so a confusion probability is never averaged
 * across a class boundary). Nodata pixels fall back to the spread the scenario declares for the role.
 * The ensemble (layers/screening/cell-ensemble-model.ts) uses the value as that cell's standard
 * deviation or confusion probability.
 */
import {
  GRID_ROLES,
  type GridEntry,
  type GridRole,
  type GridRoleId,
  type InputsConfig,
} from '../inputs-config';
import type { SpreadRole } from '../../layers/screening/uncertainty-schema';

/** What a companion grid holds: a standard deviation or a confusion probability. */
export type CompanionKind = 'sd' | 'confusion';

/** The unit a confusion-probability grid is read in (a fraction in [0, 1]). */
export const CONFUSION_UNIT = 'fraction';

/**
 * The unit conversion of a role for values (no companion), for standard deviations (its linear part)
 * or for confusion probabilities (none: a fraction).
 */
export function unitConversion(
  roleId: GridRoleId,
  unit: string,
  companion?: CompanionKind,
): (v: number) => number {
  if (companion === 'confusion') return (v) => v;
  const convert = (GRID_ROLES[roleId].units as Record<string, (v: number) => number>)[unit];
  if (companion !== 'sd') return convert;
  const zero = convert(0);
  return zero === 0 ? convert : (v) => convert(v) - zero;
}

/** The pseudo-role a standard-deviation grid is checked against: same units, range [0, span]. */
export function sdRoleOf(roleId: GridRoleId): GridRole {
  const role = GRID_ROLES[roleId] as GridRole;
  const units = Object.fromEntries(Object.keys(role.units).map((u) => [u, unitConversion(roleId, u, 'sd')]));
  return {
    kind: 'continuous',
    required: false,
    title: `${role.title} (standard deviation)`,
    units,
    range: [0, role.range[1] - role.range[0]],
  };
}

/** The pseudo-role a confusion-probability grid is checked against: a fraction in [0, 1]. */
export function confusionRoleOf(roleId: GridRoleId): GridRole {
  return {
    kind: 'continuous',
    required: false,
    title: `${GRID_ROLES[roleId].title} (confusion probability)`,
    units: { [CONFUSION_UNIT]: (v: number) => v },
    range: [0, 1],
  };
}

/** The companion grid an entry names, if any: its file and kind. */
export function companionOf(entry: GridEntry): { file: string; kind: CompanionKind } | null {
  if (entry.sdFile !== undefined) return { file: entry.sdFile, kind: 'sd' };
  if (entry.confusionFile !== undefined) return { file: entry.confusionFile, kind: 'confusion' };
  return null;
}

/** The input-config field that names a companion of this kind (for error paths). */
export const companionField = (kind: CompanionKind) => (kind === 'sd' ? 'sdFile' : 'confusionFile');

/** How a companion's values are named in messages: "standard deviation of meanAirTemp_C". */
export const companionWhat = (kind: CompanionKind, role: string) =>
  `${kind === 'sd' ? 'standard deviation' : 'confusion probability'} of ${role}`;

/**
 * The grid entry under which the companion file is read: the input's role, its own file (band 1, its
 * own nodata) in the input's unit (standard deviation) or as a fraction (confusion probability); the
 * polygon and NetCDF selectors of the input do not carry over.
 */
export function companionEntryOf(
  entry: GridEntry,
  companion: { file: string; kind: CompanionKind },
): GridEntry {
  return {
    role: entry.role,
    file: companion.file,
    unit: companion.kind === 'sd' ? entry.unit : CONFUSION_UNIT,
    kind: 'continuous',
    ...(entry.provenance ? { provenance: entry.provenance } : {}),
    ...(entry.licence ? { licence: entry.licence } : {}),
  };
}

/** The pseudo-role of a companion grid of `roleId`. */
export function companionRoleOf(roleId: GridRoleId, kind: CompanionKind): GridRole {
  return kind === 'sd' ? sdRoleOf(roleId) : confusionRoleOf(roleId);
}

/** The roles whose inputs-config entry names a companion spread grid (standard deviation or confusion). */
export function sdGridRoles(config: InputsConfig): SpreadRole[] {
  return config.grids.filter((g) => companionOf(g) !== null).map((g) => g.role as SpreadRole);
}
