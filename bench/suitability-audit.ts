/**
 * Suitability audit of a finished build (issue 13's before/after counts), read from its GeoTIFFs:
 *
 *   npx tsx bench/suitability-audit.ts <build-dir>
 *
 * Prints the class shares and, among "good" cells, how many
 *  - end the design life warmer than −1 °C at pile depth: without piles (band groundTempEnd) and, where
 *    the build has it, along the adfreeze zone with the piles operating (band adfreezeTempEndPiles);
 *  - stand on rock within the pile: bedrock shallower than the pile tip (scenario pile top + length),
 *    and shallower than the tip plus 1 m of embedment;
 *  - are thaw-unstable (excess ice > 0, band excessIce) with thaw at the reference depth within the
 *    design life (band thawYearPiles, or thawYear where the piles are not credited).
 * Also the warmest good cell today and the share of good cells ending the life above −0.5 °C.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { fromFile } from 'geotiff';

interface Manifest {
  scenario: {
    startYear: number;
    designLife_yr: number;
    pile: { length_m: number; topDepth_m: number };
  };
}

async function band(dir: string, id: string): Promise<Float32Array | null> {
  try {
    const tiff = await fromFile(join(dir, 'geotiff', `${id}.tif`));
    const img = await tiff.getImage();
    const [r] = (await img.readRasters()) as unknown as ArrayLike<number>[];
    const a = Float32Array.from(r as ArrayLike<number>);
    for (let i = 0; i < a.length; i++) if (a[i] === -9999) a[i] = NaN;
    return a;
  } catch {
    return null;
  }
}

async function main(): Promise<void> {
  const dir = process.argv[2];
  if (!dir) throw new Error('usage: tsx bench/suitability-audit.ts <build-dir>');
  const man = JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8')) as Manifest;
  const s = man.scenario;
  const tip = s.pile.topDepth_m + s.pile.length_m;
  const lifeEnd = s.startYear + s.designLife_yr;
  const need = async (id: string) => {
    const b = await band(dir, id);
    if (!b) throw new Error(`band ${id} missing from ${dir}/geotiff`);
    return b;
  };
  const cls = await need('suitability');
  const tEnd = await need('groundTempEnd');
  const tNow = await need('groundTemp');
  const rock = await need('bedrockDepth');
  const ice = await need('excessIce');
  const thawP = await need('thawYearPiles');
  const thaw0 = await need('thawYear');
  const adf = await band(dir, 'adfreezeTempEndPiles');
  const counts = [0, 0, 0, 0];
  let screened = 0;
  const good = {
    n: 0,
    endAboveMinus1: 0,
    endAboveMinus05: 0,
    adfreezeAboveMinus1: 0,
    rockWithinPile: 0,
    rockWithinPilePlus1m: 0,
    unstableThawInLifePiles: 0,
    unstableThawInLifeNoPiles: 0,
    warmestToday_C: -Infinity,
  };
  for (let i = 0; i < cls.length; i++) {
    const c = cls[i];
    if (Number.isNaN(c)) continue;
    screened++;
    counts[c]++;
    if (c !== 3) continue;
    good.n++;
    if (tEnd[i] > -1) good.endAboveMinus1++;
    if (tEnd[i] > -0.5) good.endAboveMinus05++;
    if (adf && adf[i] > -1) good.adfreezeAboveMinus1++;
    if (rock[i] < tip) good.rockWithinPile++;
    if (rock[i] < tip + 1) good.rockWithinPilePlus1m++;
    if (ice[i] > 0 && thawP[i] <= lifeEnd) good.unstableThawInLifePiles++;
    if (ice[i] > 0 && thaw0[i] <= lifeEnd) good.unstableThawInLifeNoPiles++;
    if (tNow[i] > good.warmestToday_C) good.warmestToday_C = tNow[i];
  }
  const share = (n: number) => +(n / screened).toFixed(4);
  console.log(
    JSON.stringify(
      {
        build: dir.split('/').pop(),
        screened,
        classShares: {
          excluded: share(counts[0]),
          poor: share(counts[1]),
          fair: share(counts[2]),
          good: share(counts[3]),
        },
        pileTip_m: tip,
        lifeEndYear: lifeEnd,
        good: {
          ...good,
          shareEndAboveMinus05: good.n ? +(good.endAboveMinus05 / good.n).toFixed(3) : 0,
          adfreezeBandPresent: adf !== null,
        },
      },
      null,
      2,
    ),
  );
}

await main();
