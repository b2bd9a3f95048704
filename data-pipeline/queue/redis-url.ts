/**
 * The `--queue` option: the URL of the Redis server that holds the build's BullMQ queue,
 * `redis://[[user]:password@]host:port[/db]` (or `rediss://` for TLS). The password travels in the URL
 * (quote it in the shell; read it from a file or a secret store rather than typing it); messages name
 * the server without it. Before any job is queued the server is asked for PING with a short timeout,
 * so a wrong address fails in seconds with one line instead of retrying forever.
 */
import { Redis } from 'ioredis';
import { InputError } from '../input-error';

export interface QueueConnection {
  /** The URL as given (with the password: pass it to BullMQ only). */
  url: string;
  /** The URL without the password, for messages and logs. */
  display: string;
  /** BullMQ connection options (BullMQ workers need maxRetriesPerRequest null). */
  options: { url: string; maxRetriesPerRequest: null };
}

/** Parse and check a `--queue` URL (`option` names the option in messages). */
export function parseQueueUrl(value: string, option = '--queue'): QueueConnection {
  let url: URL;
  try {
    url = new URL(value);
  } catch {
    throw new InputError(
      `${option} "${value}": not a URL; expected redis://host:port (or redis://:password@host:port/db)`,
    );
  }
  if (url.protocol !== 'redis:' && url.protocol !== 'rediss:') {
    throw new InputError(`${option}: expected a redis:// or rediss:// URL, got "${url.protocol}//..."`);
  }
  if (!url.hostname) throw new InputError(`${option}: the URL names no host (expected redis://host:port)`);
  const db = url.pathname.replace(/^\//, '');
  if (db !== '' && !/^\d{1,2}$/.test(db)) {
    throw new InputError(`${option}: the path must be a database number 0-99 (e.g. /0), got "/${db}"`);
  }
  const display = `${url.protocol}//${url.hostname}:${url.port || '6379'}${db ? `/${db}` : ''}`;
  return { url: value, display, options: { url: value, maxRetriesPerRequest: null } };
}

/** PING the server; a clear InputError naming the server (no password) if it does not answer. */
export async function checkQueueServer(c: QueueConnection, timeout_ms = 5000): Promise<void> {
  const redis = new Redis(c.url, {
    lazyConnect: true,
    connectTimeout: timeout_ms,
    maxRetriesPerRequest: 0,
    retryStrategy: () => null,
  });
  redis.on('error', () => undefined);
  try {
    await redis.connect();
    await redis.ping();
  } catch (err) {
    throw new InputError(
      `--queue ${c.display}: no Redis server answered (${(err as Error).message}); ` +
        'start redis-server there, or check the address, port and password',
    );
  } finally {
    redis.disconnect();
  }
}
