import { Worker } from 'node:worker_threads'
import type { Signposts } from '#shared/observations/signposts'
import type { SignpostsWork } from '../../workers/signposts-worker'

// Signposts are worked out on a worker thread (server/workers/signposts-worker.ts), one at a time:
// the request awaits its turn and the answer, and the request thread stays free for everyone else.

let turn: Promise<unknown> = Promise.resolve()

function runWorker(work: SignpostsWork): Promise<Signposts> {
  const worker = new Worker(workerScript('signposts-worker'), { workerData: work })
  return new Promise<Signposts>((resolve, reject) => {
    worker.once('message', (reply: { signposts?: Signposts, error?: string }) =>
      reply.signposts ? resolve(reply.signposts) : reject(new Error(reply.error ?? 'The signposts worker gave no answer.')))
    worker.once('error', reject)
  }).finally(() => void worker.terminate())
}

/** The signposts of one decision, computed off the request thread after any computed before it. */
export function signpostsOffThread(work: SignpostsWork): Promise<Signposts> {
  const result = turn.then(() => runWorker(work))
  turn = result.catch(() => {})
  return result
}
