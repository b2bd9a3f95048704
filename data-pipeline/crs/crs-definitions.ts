/**
 * Coordinate reference systems the pipeline understands, as our own proj4 definition strings (no
 * lookup service, no network). Parameters are the published EPSG definitions; they were written from
 * memory, then compared with the definition strings published for each code, and are checked against
 * published coordinates in tests/reference/crs-definitions.test.ts (EPSG:3573, 3995, UTM, 3857 to
 * 1 cm; EPSG:3413 by its definition: pole at the origin, true scale at 70° N) and in tests/pipeline.
 * Add a code here to accept grids in another CRS.
 */
import proj4 from 'proj4';

/** EPSG code -> proj4 definition. */
export const CRS_DEFINITIONS: Record<string, string> = {
  'EPSG:4326': '+proj=longlat +datum=WGS84 +no_defs',
  'EPSG:3857':
    '+proj=merc +a=6378137 +b=6378137 +lat_ts=0 +lon_0=0 +x_0=0 +y_0=0 +k=1 +units=m +nadgrids=@null +no_defs',
  // NSIDC Sea Ice Polar Stereographic North (WGS 84), true scale at 70°N.
  'EPSG:3413':
    '+proj=stere +lat_0=90 +lat_ts=70 +lon_0=-45 +k=1 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
  // WGS 84 / Arctic Polar Stereographic, true scale at 71°N.
  'EPSG:3995': '+proj=stere +lat_0=90 +lat_ts=71 +lon_0=0 +k=1 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
  // NAD83 / Alaska Albers (NAD83 taken as WGS 84: a metre or two apart, negligible at 1 km cells).
  'EPSG:3338':
    '+proj=aea +lat_0=50 +lon_0=-154 +lat_1=55 +lat_2=65 +x_0=0 +y_0=0 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs',
  // NAD83 / Canada Atlas Lambert.
  'EPSG:3978':
    '+proj=lcc +lat_0=49 +lon_0=-95 +lat_1=49 +lat_2=77 +x_0=0 +y_0=0 +ellps=GRS80 +towgs84=0,0,0,0,0,0,0 +units=m +no_defs',
  // WGS 84 / North Pole Lambert azimuthal equal-area series.
  'EPSG:3571': '+proj=laea +lat_0=90 +lon_0=180 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
  'EPSG:3572': '+proj=laea +lat_0=90 +lon_0=-150 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
  'EPSG:3573': '+proj=laea +lat_0=90 +lon_0=-100 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
  'EPSG:3574': '+proj=laea +lat_0=90 +lon_0=-40 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
  'EPSG:3575': '+proj=laea +lat_0=90 +lon_0=10 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
  'EPSG:3576': '+proj=laea +lat_0=90 +lon_0=90 +x_0=0 +y_0=0 +datum=WGS84 +units=m +no_defs',
};

/** The analysis CRS: every build resamples onto a grid in this system (polar, conformal, not Mercator). */
export const ANALYSIS_CRS = 'EPSG:3413';

/** proj4 definition for an EPSG code string, including WGS 84 UTM zones (EPSG:326zz / 327zz). */
export function proj4DefinitionFor(crs: string): string | undefined {
  const known = CRS_DEFINITIONS[crs];
  if (known) return known;
  const utm = /^EPSG:32([67])(\d\d)$/.exec(crs);
  if (utm) {
    const zone = Number(utm[2]);
    if (zone >= 1 && zone <= 60) {
      return `+proj=utm +zone=${zone}${utm[1] === '7' ? ' +south' : ''} +datum=WGS84 +units=m +no_defs`;
    }
  }
  return undefined;
}

export type PointTransform = (x: number, y: number) => [number, number];

/** A coordinate transform between two supported CRSs; throws RangeError naming an unknown code. */
export function createTransform(fromCrs: string, toCrs: string): PointTransform {
  const from = proj4DefinitionFor(fromCrs);
  const to = proj4DefinitionFor(toCrs);
  if (!from) throw new RangeError(`unsupported CRS ${fromCrs}`);
  if (!to) throw new RangeError(`unsupported CRS ${toCrs}`);
  if (from === to) return (x, y) => [x, y];
  const converter = proj4(from, to);
  return (x, y) => {
    const p = converter.forward([x, y]);
    return [p[0], p[1]];
  };
}
