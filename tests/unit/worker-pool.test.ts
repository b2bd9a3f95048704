/**
 * The build's worker pool (data-pipeline/worker-pool.ts): every job answered once, the close
 * handshake before the workers end, and the first error rejecting with the worker's label.
 */
import { describe, expect, it } from 'vitest';
import { runWorkerPool } from '../../data-pipeline/worker-pool';

// A worker that doubles `n`, fails on n = 13, and answers `close` with `closed`.
const WORKER = new URL(
  'data:text/javascript,' +
    encodeURIComponent(`
      import { parentPort } from 'node:worker_threads';
      parentPort.on('message', (m) => {
        if (m.close) parentPort.postMessage({ closed: true });
        else if (m.n === 13) parentPort.postMessage({ error: 'thirteen' });
        else parentPort.postMessage({ n: m.n, twice: 2 * m.n });
      });
    `),
);

describe('runWorkerPool', () => {
  it('answers every job once, on up to `size` workers, then closes them', async () => {
    const answers: number[] = [];
    await runWorkerPool<number, { error?: string; n: number; twice: number }>({
      script: WORKER,
      workerData: null,
      size: 3,
      jobs: [1, 2, 3, 4, 5, 6, 7],
      message: (n) => ({ n }),
      onAnswer: (a) => answers.push(a.twice),
      label: 'test worker',
      closeMessage: { close: true },
    });
    expect(answers.sort((a, b) => a - b)).toEqual([2, 4, 6, 8, 10, 12, 14]);
  });

  it('resolves at once with no jobs', async () => {
    await expect(
      runWorkerPool({
        script: WORKER,
        workerData: null,
        size: 2,
        jobs: [],
        message: (n: number) => ({ n }),
        onAnswer: () => {},
        label: 'test worker',
      }),
    ).resolves.toBeUndefined();
  });

  it('rejects with the first worker error, naming the worker', async () => {
    await expect(
      runWorkerPool({
        script: WORKER,
        workerData: null,
        size: 2,
        jobs: [1, 13, 2],
        message: (n: number) => ({ n }),
        onAnswer: () => {},
        label: 'test worker',
      }),
    ).rejects.toThrow('test worker failed: thirteen');
  });
});
