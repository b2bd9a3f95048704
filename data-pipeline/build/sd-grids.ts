/**
 * Companion standard-deviation grids (issue 14 item 1): an inputs-config grid entry may name, in
 * `sdFile`, a second raster holding the standard deviation of that input cell by cell, in the entry's
 * own `unit`. It is read exactly like the input (load-inputs.ts: GDAL, the file's scale and offset,
 * nodata), warped onto the analysis grid with the input's own method (align-inputs.ts), and converted
 * with the linear part of the unit conversion (a standard deviation in K is one in °C; one in percent
 * is a hundredth of one in m³/m³). Every value must be finite and lie in [0, span of the role's
 * plausible range]; nodata pixels fall back to the spread the scenario declares for the role. The
 * ensemble (layers/screening/cell-ensemble-model.ts) uses it as that cell's standard deviation.
 */
import {
  GRID_ROLES,
  type GridEntry,
  type GridRole,
  type GridRoleId,
  type InputsConfig,
} from '../inputs-config';
import type { SpreadRole } from '../../layers/screening/uncertainty-schema';

/** The unit conversion of a role for values (`sd` false) or for standard deviations (its linear part). */
export function unitConversion(roleId: GridRoleId, unit: string, sd: boolean): (v: number) => number {
  const convert = (GRID_ROLES[roleId].units as Record<string, (v: number) => number>)[unit];
  if (!sd) return convert;
  const zero = convert(0);
  return zero === 0 ? convert : (v) => convert(v) - zero;
}

/** The pseudo-role a standard-deviation grid is checked against: same units, range [0, span]. */
export function sdRoleOf(roleId: GridRoleId): GridRole {
  const role = GRID_ROLES[roleId] as GridRole;
  const units = Object.fromEntries(Object.keys(role.units).map((u) => [u, unitConversion(roleId, u, true)]));
  return {
    kind: 'continuous',
    required: false,
    title: `${role.title} (standard deviation)`,
    units,
    range: [0, role.range[1] - role.range[0]],
  };
}

/**
 * The grid entry under which the companion file is read: the input's role and unit, its own file
 * (band 1, its own nodata); the polygon and NetCDF selectors of the input do not carry over.
 */
export function sdEntryOf(entry: GridEntry & { sdFile: string }): GridEntry {
  return {
    role: entry.role,
    file: entry.sdFile,
    unit: entry.unit,
    kind: 'continuous',
    ...(entry.provenance ? { provenance: entry.provenance } : {}),
    ...(entry.licence ? { licence: entry.licence } : {}),
  };
}

/** The roles whose inputs-config entry names a standard-deviation grid. */
export function sdGridRoles(config: InputsConfig): SpreadRole[] {
  return config.grids.filter((g) => g.sdFile !== undefined).map((g) => g.role as SpreadRole);
}
