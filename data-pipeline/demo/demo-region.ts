/**
 * The invented demo region "Skerrowmark": a generated landmass over open ocean in the Greenland Sea
 * (centred near 75°N, 3°W, where there is no real land), about 350 x 280 km, with an irregular
 * coastline, two small islands, uplands in the interior and invented settlements.
 *
 * Geometry lives in a local east/north frame in km around the centre (equirectangular on the sphere:
 * dx = Δlon · 111.32 · cos(lat), dy = Δlat · 110.574). Each coastline is star-shaped about its centre:
 * radius R(θ) = ellipse radius · (1 + Σ_k a_k sin(kθ + φ_k)) with seeded harmonics, so the land mask
 * and the coastline polygons written to land.geojson agree exactly. `s = 1 - r / R(θ)` is the
 * normalised inland distance (0 on the coast, 1 at the centre, negative at sea).
 * All climate and soil fields below are invented but physically plausible (colder north and higher,
 * larger annual amplitude inland, fine ice-rich soils in lowlands, coarse soils on outwash and coasts,
 * bedrock on uplands). None of it describes a real place.
 */
import { createRandom, fractalNoise } from './seeded-random';

export const DEMO_REGION_NAME = 'Skerrowmark';
export const DEMO_CENTRE = { lon: -3, lat: 75 } as const;
/** Extent of the geographic demo grids, degrees [west, south, east, north]. */
export const DEMO_BOUNDS_DEG: [number, number, number, number] = [-10, 73.6, 4, 76.4];

const KM_PER_DEG_LAT = 110.574;
const KM_PER_DEG_LON_EQ = 111.32;

interface StarShape {
  cx_km: number;
  cy_km: number;
  a_km: number;
  b_km: number;
  harmonics: { k: number; amp: number; phase: number }[];
}

export interface DemoCell {
  land: boolean;
  /** Normalised inland distance: 0 coast, 1 centre, < 0 at sea. */
  inland: number;
  elevation_m: number;
  textureClass: number;
  waterContent_m3m3: number;
  bedrockDepth_m: number;
  meanAirTemp_C: number;
  airAmplitude_C: number;
  warming_C_per_yr: number;
}

export interface DemoSettlement {
  name: string;
  lon: number;
  lat: number;
  population: number;
}

export interface DemoRegion {
  sample(lon: number, lat: number): DemoCell;
  /** Coastline rings (closed, counter-clockwise, [lon, lat]), main landmass first. */
  coastlines(): [number, number][][];
  settlements: DemoSettlement[];
}

const SETTLEMENT_NAMES = ['Lanternhook', 'Mossridge Landing', 'Tollerby Flats', 'Quillstrand', 'Ember Cove'];

function toLocal(lon: number, lat: number): [number, number] {
  return [
    (lon - DEMO_CENTRE.lon) * KM_PER_DEG_LON_EQ * Math.cos((lat * Math.PI) / 180),
    (lat - DEMO_CENTRE.lat) * KM_PER_DEG_LAT,
  ];
}

function toLonLat(dx_km: number, dy_km: number): [number, number] {
  const lat = DEMO_CENTRE.lat + dy_km / KM_PER_DEG_LAT;
  return [DEMO_CENTRE.lon + dx_km / (KM_PER_DEG_LON_EQ * Math.cos((lat * Math.PI) / 180)), lat];
}

function makeShape(
  random: () => number,
  centre: [number, number],
  a_km: number,
  b_km: number,
  roughness: number,
): StarShape {
  const harmonics = [];
  for (let k = 2; k <= 40; k++) {
    harmonics.push({ k, amp: (roughness * (0.4 + 0.6 * random())) / k, phase: 2 * Math.PI * random() });
  }
  return { cx_km: centre[0], cy_km: centre[1], a_km, b_km, harmonics };
}

function shapeRadius(shape: StarShape, theta: number): number {
  const c = Math.cos(theta);
  const s = Math.sin(theta);
  const ellipse = (shape.a_km * shape.b_km) / Math.hypot(shape.b_km * c, shape.a_km * s);
  let wobble = 0;
  for (const h of shape.harmonics) wobble += h.amp * Math.sin(h.k * theta + h.phase);
  return ellipse * (1 + wobble);
}

function inlandOf(shape: StarShape, dx: number, dy: number): number {
  const x = dx - shape.cx_km;
  const y = dy - shape.cy_km;
  const r = Math.hypot(x, y);
  return 1 - r / shapeRadius(shape, Math.atan2(y, x));
}

const clamp = (v: number, lo: number, hi: number): number => (v < lo ? lo : v > hi ? hi : v);
const smoothstep = (e0: number, e1: number, v: number): number => {
  const t = clamp((v - e0) / (e1 - e0), 0, 1);
  return t * t * (3 - 2 * t);
};

/** Texture code of a demo cell: rock on the uplands, gravel in valleys and on shores, then silts and peat. */
function demoTexture(elevation_m: number, s: number, valley: boolean, soilNoise: number): number {
  if (elevation_m > 520) return valley ? 1 : 6;
  if (s < 0.05) return soilNoise > 0.25 ? 1 : 2;
  if (valley) return elevation_m > 180 ? 1 : 2;
  if (elevation_m > 300) return soilNoise > 0.1 ? 1 : 3;
  return soilNoise < -0.12 ? 5 : soilNoise < 0.22 ? 3 : 4;
}

/** The demo fields at (lon, lat) for the region's landmasses and seed. */
function sampleDemoCell(shapes: StarShape[], seed: number, lon: number, lat: number): DemoCell {
  const [dx, dy] = toLocal(lon, lat);
  let inland = -Infinity;
  for (const shape of shapes) inland = Math.max(inland, inlandOf(shape, dx, dy));
  const land = inland >= 0;
  const s = clamp(inland, 0, 1);
  const north = clamp((lat - DEMO_BOUNDS_DEG[1]) / (DEMO_BOUNDS_DEG[3] - DEMO_BOUNDS_DEG[1]), 0, 1);
  const upland = smoothstep(0.22, 0.85, s + 0.3 * fractalNoise(dx / 45, dy / 45, seed + 1, 4));
  const elevation_m = Math.max(
    0,
    1150 * upland * (0.65 + 0.35 * fractalNoise(dx / 14, dy / 14, seed + 2, 3)) + 60 * s,
  );
  const valley = Math.abs(fractalNoise(dx / 32, dy / 32, seed + 3, 3)) < 0.07;
  const soilNoise = fractalNoise(dx / 18, dy / 18, seed + 4, 4);
  const texture = demoTexture(elevation_m, s, valley, soilNoise);
  const baseWater = [0, 0.15, 0.24, 0.5, 0.45, 0.8, 0.025][texture];
  const lowland = 1 - clamp(elevation_m / 300, 0, 1);
  const waterContent_m3m3 = clamp(
    baseWater * (0.9 + 0.15 * lowland) + 0.04 * fractalNoise(dx / 9, dy / 9, seed + 5, 2),
    0.02,
    0.92,
  );
  const bedrockDepth_m =
    texture === 6
      ? 0.3 + 1.2 * Math.abs(fractalNoise(dx / 7, dy / 7, seed + 6, 2))
      : clamp(
          35 * (1 - elevation_m / 650) + 12 * fractalNoise(dx / 20, dy / 20, seed + 6, 3) + 4 * (1 - s),
          1,
          80,
        );
  const meanAirTemp_C =
    -3.2 - 2.6 * north - 0.005 * elevation_m - 1.0 * s + 0.3 * fractalNoise(dx / 60, dy / 60, seed + 7, 2);
  const airAmplitude_C = 12.5 + 8 * s + 0.8 * north + 0.5 * fractalNoise(dx / 50, dy / 50, seed + 8, 2);
  const warming_C_per_yr = clamp(
    0.035 + 0.03 * north + 0.008 * fractalNoise(dx / 80, dy / 80, seed + 9, 2) + 0.006 * s,
    0.03,
    0.08,
  );
  return {
    land,
    inland,
    elevation_m,
    textureClass: land ? texture : 0,
    waterContent_m3m3,
    bedrockDepth_m,
    meanAirTemp_C,
    airAmplitude_C,
    warming_C_per_yr,
  };
}

/** Closed coastline ring of a landmass, `n` vertices, lon/lat. */
function coastlineRing(shape: StarShape, n: number): [number, number][] {
  const ring: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    const theta = (2 * Math.PI * i) / n;
    const r = shapeRadius(shape, theta);
    ring.push(toLonLat(shape.cx_km + r * Math.cos(theta), shape.cy_km + r * Math.sin(theta)));
  }
  ring.push(ring[0]);
  return ring;
}

/** Build the demo region for a seed (deterministic). */
export function createDemoRegion(seed: number): DemoRegion {
  const random = createRandom(seed);
  const main = makeShape(random, [0, 0], 165, 122, 0.3);
  const islands = [
    makeShape(random, [-150 + 10 * random(), 132 + 4 * random()], 15, 11, 0.25),
    makeShape(random, [186 + 6 * random(), -100 + 10 * random()], 11, 9, 0.25),
  ];
  const shapes = [main, ...islands];

  const sample = (lon: number, lat: number): DemoCell => sampleDemoCell(shapes, seed, lon, lat);
  const coastlines = (): [number, number][][] =>
    shapes.map((shape) => coastlineRing(shape, shape === main ? 720 : 120));

  // Settlements: four on the coast of the main landmass (just inside the shore), one inland lowland.
  const settlements: DemoSettlement[] = SETTLEMENT_NAMES.map((name, i) => {
    const theta = (2 * Math.PI * (i + 0.3 * random())) / 4 + 0.4;
    let fraction = i < 4 ? 0.96 : 0.45;
    let lonlat = toLonLat(0, 0);
    for (let tries = 0; tries < 40; tries++) {
      const r = fraction * shapeRadius(main, theta);
      lonlat = toLonLat(r * Math.cos(theta), r * Math.sin(theta));
      const cell = sample(lonlat[0], lonlat[1]);
      if (cell.land && cell.elevation_m < 250 && cell.textureClass !== 6) break;
      fraction -= 0.02;
    }
    const population = Math.round(150 + 2200 * random() ** 2);
    return { name, lon: +lonlat[0].toFixed(5), lat: +lonlat[1].toFixed(5), population };
  });

  return { sample, coastlines, settlements };
}
