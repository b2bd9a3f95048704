/**
 * A throw-away Redis server for the queue tests and benchmark: Debian's `redis-server` binary on a free
 * loopback port, no persistence (`--save '' --appendonly no`), stopped by `stop()`. Fails with a clear
 * message when the binary is missing (CI installs it: .ci/run).
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createServer } from 'node:net';
import { Redis } from 'ioredis';

export const REDIS_SERVER = '/usr/bin/redis-server';

/** A free TCP port on 127.0.0.1 (asked from the kernel, then released). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = createServer();
    server.once('error', reject);
    server.listen(0, '127.0.0.1', () => {
      const address = server.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      server.close(() => resolve(port));
    });
  });
}

export interface RedisFixture {
  url: string;
  process: ChildProcess;
  stop(): Promise<void>;
}

export async function startRedis(): Promise<RedisFixture> {
  if (!existsSync(REDIS_SERVER)) {
    throw new Error(
      `${REDIS_SERVER} not found: install Debian's redis-server package (apt-get install redis-server)`,
    );
  }
  const port = await freePort();
  const child = spawn(
    REDIS_SERVER,
    [
      '--port',
      String(port),
      '--bind',
      '127.0.0.1',
      '--save',
      '',
      '--appendonly',
      'no',
      '--protected-mode',
      'yes',
    ],
    { stdio: ['ignore', 'ignore', 'pipe'] },
  );
  const url = `redis://127.0.0.1:${port}`;
  const deadline = Date.now() + 10_000;
  for (;;) {
    const redis = new Redis(url, { lazyConnect: true, retryStrategy: () => null, maxRetriesPerRequest: 0 });
    redis.on('error', () => undefined);
    try {
      await redis.connect();
      await redis.ping();
      redis.disconnect();
      break;
    } catch {
      redis.disconnect();
      if (Date.now() > deadline || child.exitCode !== null)
        throw new Error(`redis-server did not start on port ${port}`);
      await new Promise((r) => setTimeout(r, 100));
    }
  }
  return {
    url,
    process: child,
    stop: () =>
      new Promise<void>((resolve) => {
        if (child.exitCode !== null) return resolve();
        child.once('exit', () => resolve());
        child.kill('SIGTERM');
      }),
  };
}
