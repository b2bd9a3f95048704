/** The boundary worker: runs one boundary job per message (boundary-job.ts) off the main thread. */
import '../zod-jitless';
import { replyTransferables, runBoundaryJob, type BoundaryJobRequest } from './boundary-job';

self.onmessage = (event: MessageEvent<BoundaryJobRequest>) => {
  runBoundaryJob(event.data).then(
    (reply) => postMessage(reply, { transfer: replyTransferables(reply) }),
    (e: unknown) =>
      postMessage({
        type: 'refused',
        id: event.data.id,
        problems: [`could not be read: ${(e as Error).message}`],
      }),
  );
};
