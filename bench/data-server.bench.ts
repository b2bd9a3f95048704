/**
 * Throughput of the preview server for the map's tile band reads (HTTP Range, one band plane per
 * request), through every middleware the app is served with (URL guard, security headers, data
 * directory). Keep-alive clients on the loopback interface, a bounded run (DATA_BENCH_REQUESTS,
 * default 20,000, at DATA_BENCH_CONCURRENCY, default 16), random band planes of the built tiles.
 * Prints requests per second, p50/p99 latency and the error count.
 */
import { readdirSync, statSync } from 'node:fs';
import { Agent, request } from 'node:http';
import { join, relative } from 'node:path';
import { TILE_SIZE } from '../layers/screening/tile-format';
import {
  buildWebAppIfStale,
  DEFAULT_DATA_DIR,
  DEFAULT_INPUTS_DIR,
  serveWebApp,
} from '../web/build/web-server';
import { ensureDemoTiles } from '../data-pipeline/demo/ensure-demo-tiles';
import { createRandom } from '../data-pipeline/demo/seeded-random';

/** One band plane of a tile: TILE_SIZE² 16-bit values (as web/src/data/tile-store.ts reads it). */
const PLANE_BYTES = TILE_SIZE * TILE_SIZE * 2;

function tileFiles(dir: string): string[] {
  const out: string[] = [];
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else if (p.endsWith('.bin')) out.push(p);
    }
  };
  walk(join(dir, 'tiles'));
  return out;
}

export async function run(): Promise<void> {
  const total = Number(process.env.DATA_BENCH_REQUESTS ?? 20_000);
  const concurrency = Number(process.env.DATA_BENCH_CONCURRENCY ?? 16);
  await ensureDemoTiles({ dataDir: DEFAULT_DATA_DIR, inputsDir: DEFAULT_INPUTS_DIR });
  await buildWebAppIfStale(DEFAULT_DATA_DIR);
  const { server, url } = await serveWebApp({ dataDir: DEFAULT_DATA_DIR, port: 0 });
  const u = new URL(url);
  const files = tileFiles(DEFAULT_DATA_DIR).map((f) => ({
    path: `/data/${relative(DEFAULT_DATA_DIR, f)}`,
    size: statSync(f).size,
  }));
  const random = createRandom(2026);
  const agent = new Agent({ keepAlive: true, maxSockets: concurrency });
  const latencies: number[] = [];
  let errors = 0;
  let sent = 0;
  const one = () =>
    new Promise<void>((resolve) => {
      const f = files[Math.floor(random() * files.length)];
      const planes = Math.max(1, Math.floor(f.size / PLANE_BYTES));
      const start = Math.floor(random() * planes) * PLANE_BYTES;
      const t0 = performance.now();
      const r = request(
        {
          host: u.hostname,
          port: u.port,
          path: f.path,
          agent,
          headers: { Range: `bytes=${start}-${start + PLANE_BYTES - 1}` },
        },
        (res) => {
          res.on('data', () => undefined);
          res.on('end', () => {
            latencies.push(performance.now() - t0);
            if (res.statusCode !== 206) errors++;
            resolve();
          });
        },
      );
      r.on('error', () => {
        errors++;
        resolve();
      });
      r.end();
    });
  const t0 = performance.now();
  await Promise.all(
    Array.from({ length: concurrency }, async () => {
      while (sent < total) {
        sent++;
        await one();
      }
    }),
  );
  const elapsed_s = (performance.now() - t0) / 1000;
  agent.destroy();
  await server.close();
  latencies.sort((a, b) => a - b);
  const q = (p: number) => latencies[Math.min(latencies.length - 1, Math.floor(p * latencies.length))];
  console.log(
    `${total.toLocaleString('en-US')} band reads at concurrency ${concurrency}: ${(total / elapsed_s).toFixed(0)} req/s, ` +
      `p50 ${q(0.5).toFixed(1)} ms, p99 ${q(0.99).toFixed(1)} ms, ${errors} errors`,
  );
}
