/**
 * Kill tests (issue 16 items 2 and 7): a build is stopped at every stage, the final swap included,
 * by `kill -9` (nothing can run after it) and by SIGTERM to the `pile-atlas` bin and to `npm run`.
 * Each time: the previous output is whole at that instant (at --out, or, mid-swap, at the aside path
 * the swap journal names), it is byte-identical at --out once the next build has started (recovery),
 * nothing is left beside it, and no process of the killed build survives. The stages are held by the
 * fault points of data-pipeline/build/fault-points.ts (PILE_ATLAS_FAULT=<stage>:pause).
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { cp, readdir, readFile } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recoverOutput } from '../../data-pipeline/build/atomic-output';
import { FAULT_ENV, FAULT_STAGES, type FaultStage } from '../../data-pipeline/build/fault-points';
import { hashTree, makeTempDir, removeTempDirs, runCli, SMALL_DEMO, smallDemo } from './pipeline-fixtures';

afterAll(removeTempDirs);

const ROOT = resolve(__dirname, '../..');
const BIN = join(ROOT, 'bin/pile-atlas.mjs');
const FLAGS = ['--cell-size', String(4 * SMALL_DEMO.cellSize_m), '--quiet', '--workers', '1'];

let demoDir: string;
let previous: string;
let previousTree: Record<string, string>;

beforeAll(async () => {
  demoDir = await smallDemo();
  previous = join(await makeTempDir('kill-prev'), 'tiles');
  const r = await runCli(['build', '--in', demoDir, '--out', previous, ...FLAGS, '--no-geotiff']);
  expect(r.code, r.stderr).toBe(0);
  previousTree = await hashTree(previous);
}, 180_000);

/** A fresh output directory holding a copy of the previous output. */
async function outWithPrevious(): Promise<string> {
  const out = join(await makeTempDir('kill-out'), 'tiles');
  await cp(previous, out, { recursive: true });
  return out;
}

/** Every process whose ancestry leads to `pid` (from ps), not including `pid`. */
function descendants(pid: number): number[] {
  const rows = execFileSync('ps', ['-eo', 'pid=,ppid='], { encoding: 'utf8' })
    .trim()
    .split('\n')
    .map((l) => l.trim().split(/\s+/).map(Number));
  const out: number[] = [];
  const walk = (p: number) => {
    for (const [child, parent] of rows) {
      if (parent === p) {
        out.push(child);
        walk(child);
      }
    }
  };
  walk(pid);
  return out;
}

function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}

/** Start a build held at `stage`; resolves once it has printed that it is there. */
function startHeld(command: string, args: string[], stage: FaultStage): Promise<ChildProcess> {
  const child = spawn(command, args, {
    cwd: ROOT,
    env: { ...process.env, [FAULT_ENV]: `${stage}:pause` },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  return new Promise((done, fail) => {
    let stderr = '';
    child.stderr!.on('data', (chunk: Buffer) => {
      stderr += chunk.toString();
      if (stderr.includes(`pile-atlas fault-point ${stage}`)) done(child);
    });
    child.on('exit', (code) => fail(new Error(`build exited (${code}) before ${stage}: ${stderr}`)));
  });
}

const exited = (child: ChildProcess) =>
  new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((done) => {
    if (child.exitCode !== null || child.signalCode !== null) {
      done({ code: child.exitCode, signal: child.signalCode });
    } else child.once('exit', (code, signal) => done({ code, signal }));
  });

/** Where the previous output is right now: --out, or the aside directory a swap journal names. */
async function previousOutputNow(out: string): Promise<string> {
  const journalFile = join(dirname(out), `.${basename(out)}.swap.json`);
  const journal = await readFile(journalFile, 'utf8').then(
    (t) => JSON.parse(t) as { aside: string | null },
    () => null,
  );
  return journal?.aside ? join(dirname(out), journal.aside) : out;
}

/**
 * The processes of `family` still alive after up to 10 s (tsx's esbuild service, a child of the
 * build, exits by itself when its parent's pipe closes, a moment after the parent). Kills survivors,
 * so that a failing test leaves no orphan either.
 */
async function survivorsOf(family: number[]): Promise<number[]> {
  const deadline = Date.now() + 10_000;
  while (family.some(alive) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
  const survivors = family.filter(alive);
  for (const pid of survivors) process.kill(pid, 'SIGKILL');
  return survivors;
}

const leftovers = async (out: string) =>
  (await readdir(dirname(out))).filter((n) => n.startsWith(`.${basename(out)}.`));

describe('kill -9 at every stage: the previous output is whole at that instant and back at --out after', () => {
  it('the stages are every step of a build, the two halves of the swap included', () => {
    expect([...FAULT_STAGES]).toEqual(['read', 'screen', 'tiles', 'geotiff', 'manifest', 'swap', 'swapped']);
  });

  // Concurrent: each run waits mostly on its own process start-up, which now includes compiling GDAL's
  // WebAssembly (about 1 s of CPU each, seven at once on a shared machine): hence the longer timeout.
  it.concurrent.each(FAULT_STAGES.map((s) => [s]))(
    'at %s',
    async (stage) => {
      const out = await outWithPrevious();
      const child = await startHeld(
        process.execPath,
        [BIN, 'build', '--in', demoDir, '--out', out, ...FLAGS],
        stage,
      );
      const family = descendants(child.pid!);
      child.kill('SIGKILL');
      await exited(child);
      // At the instant of the kill: whole, at --out or at the journal's aside path.
      expect(await hashTree(await previousOutputNow(out))).toEqual(previousTree);
      expect(await survivorsOf(family)).toEqual([]);
      // The next build (here: its first step, the recovery) puts it back and removes the rest.
      recoverOutput(out);
      expect(await hashTree(out)).toEqual(previousTree);
      expect(await leftovers(out)).toEqual([]);
    },
    180_000,
  );
});

describe('signals to the wrappers stop the whole build: no process left, output untouched', () => {
  it('SIGTERM to the pile-atlas bin during the tiles: exit 143, temporary output removed', async () => {
    const out = await outWithPrevious();
    const child = await startHeld(
      process.execPath,
      [BIN, 'build', '--in', demoDir, '--out', out, ...FLAGS],
      'tiles',
    );
    const family = descendants(child.pid!);
    child.kill('SIGTERM');
    const { code } = await exited(child);
    expect(code).toBe(143);
    expect(await survivorsOf(family)).toEqual([]);
    expect(await leftovers(out)).toEqual([]);
    expect(await hashTree(out)).toEqual(previousTree);
  });

  it('SIGTERM to the bin in the middle of the swap: rolled back before exit', async () => {
    const out = await outWithPrevious();
    const child = await startHeld(
      process.execPath,
      [BIN, 'build', '--in', demoDir, '--out', out, ...FLAGS],
      'swap',
    );
    child.kill('SIGTERM');
    expect((await exited(child)).code).toBe(143);
    expect(await leftovers(out)).toEqual([]);
    expect(await hashTree(out)).toEqual(previousTree);
  });

  for (const signal of ['SIGTERM', 'SIGKILL'] as const) {
    it(`${signal} to npm run pile-atlas: no orphan finishes the build later`, async () => {
      const out = await outWithPrevious();
      const npm = await startHeld(
        'npm',
        ['run', '--silent', 'pile-atlas', '--', 'build', '--in', demoDir, '--out', out, ...FLAGS],
        'screen',
      );
      const family = descendants(npm.pid!);
      expect(family.length).toBeGreaterThan(0);
      npm.kill(signal);
      await exited(npm);
      expect(await survivorsOf(family)).toEqual([]);
      recoverOutput(out);
      expect(await hashTree(out)).toEqual(previousTree);
      expect(await leftovers(out)).toEqual([]);
    });
  }
});
