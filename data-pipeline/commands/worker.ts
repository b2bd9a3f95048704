/** `pile-atlas worker`: run build jobs from a Redis-backed queue (data-pipeline/queue/queue-worker.ts). */
import { startQueueWorker } from '../queue/queue-worker';
import { checkQueueServer, parseQueueUrl } from '../queue/redis-url';
import { sharedRoot } from '../queue/shared-storage';
import type { Command } from './command';
import { numberOption, parseOptions, requireOption } from './parse-options';

export const workerCommand: Command = {
  name: 'worker',
  summary: 'take screening and tile jobs of queue-backed builds (build --queue) and run them',
  help: `pile-atlas worker --queue redis://host:port --shared <dir> [options]

Connects to the Redis server holding the build queue and runs the jobs that \`pile-atlas build
--queue\` puts there: screening windows (rows of the analysis grid) and tile subtrees. Reads the inputs
from, and writes each job's output to, the shared storage <dir>: the same storage the build names with
--shared, mounted at any path on this machine. Runs one job at a time (start one worker per core, on
as many machines as you like) until stopped (Ctrl-C, SIGTERM). A worker that dies mid-job loses
nothing: once its lock expires, the stalled-job check of the other workers puts the job back in the
queue.

Options:
  --queue <url>            redis://[:password@]host:port[/db] (rediss:// for TLS)
  --shared <dir>           this machine's path of the shared storage
  --lock-ms N              job lock duration, ms (default 30000): a job whose worker is gone is
                           retried this long after it stopped
  --stalled-check-ms N     how often this worker checks for stalled jobs, ms (default 30000)
  --quiet                  no line per job
  --help                   this text`,
  async run(argv) {
    const opts = parseOptions('worker', argv, {
      values: ['queue', 'shared', 'lock-ms', 'stalled-check-ms'],
      flags: ['quiet'],
    });
    const connection = parseQueueUrl(requireOption('worker', opts, 'queue'));
    const shared = sharedRoot(requireOption('worker', opts, 'shared'));
    const lockDuration_ms = numberOption('worker', opts, 'lock-ms', 30_000, 500, 3_600_000, true);
    const stalledInterval_ms = numberOption('worker', opts, 'stalled-check-ms', 30_000, 200, 3_600_000, true);
    await checkQueueServer(connection);
    const quiet = opts.flags.has('quiet');
    const handle = await startQueueWorker({
      connection,
      shared,
      lockDuration_ms,
      stalledInterval_ms,
      log: quiet ? undefined : (line) => process.stderr.write(`${line}\n`),
    });
    process.stderr.write(`pile-atlas worker ${handle.name}: waiting for jobs on ${connection.display}\n`);
    // Runs until a signal ends the process (cli.ts handlers).
    return new Promise<number>(() => undefined);
  },
};
