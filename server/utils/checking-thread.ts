import { Worker } from 'node:worker_threads'
import type { FieldIssue } from './json-body'
import { workerScript, type WorkerScriptName } from './worker-script'

// What a person sends that takes real work to check (a release, a site's land-motion draws) is checked
// off the request thread, on a worker of its own, within a time budget (RELEASE_WORK_MS): one large
// upload must not freeze every other request. At most MAX_RUNNING checks of any kind run at once and the
// rest wait their turn; past the budget, or with too many waiting, the answer is 503 saying what to do.

const busy = (message: string) => createError({ statusCode: 503, message })

const MAX_RUNNING = 4
const MAX_WAITING = 32
let running = 0
const waiting: Array<() => void> = []

/** The 503s of one kind of check, in words that name what was sent. */
export interface CheckWording {
  /** Too many checks are waiting already. */
  crowded: string
  /** The check ran past its budget of this many seconds and was stopped. */
  overBudget: (seconds: number) => string
}

/** A worker's answer: what it worked out, or what to fix (400), or why it failed (500). */
export interface CheckReply {
  issues?: FieldIssue[]
  error?: string
}

async function takeSlot(wording: CheckWording) {
  if (running < MAX_RUNNING) {
    running++
    return
  }
  if (waiting.length >= MAX_WAITING) throw busy(wording.crowded)
  // The slot passes straight from the work that ends to the one that waited longest.
  await new Promise<void>(resolve => waiting.push(resolve))
}

function giveSlot() {
  const next = waiting.shift()
  if (next) next()
  else running--
}

/**
 * Runs one check on a worker of the named script with `workerData`, and gives its reply; issues the
 * worker found are a 400 naming each field, as readValidBody words them.
 */
export async function checkOffThread<Reply extends CheckReply>(
  script: WorkerScriptName,
  workerData: unknown,
  wording: CheckWording,
): Promise<Reply> {
  await takeSlot(wording)
  const worker = new Worker(workerScript(script), { workerData })
  try {
    const reply = await new Promise<Reply>((resolve, reject) => {
      const budgetMs = serverConfig().RELEASE_WORK_MS
      const timer = setTimeout(() => reject(busy(wording.overBudget(budgetMs / 1000))), budgetMs)
      worker.once('message', (message: Reply) => { clearTimeout(timer); resolve(message) })
      worker.once('error', (error) => { clearTimeout(timer); reject(error) })
    })
    if (reply.issues)
      throw createError({
        statusCode: 400,
        message: reply.issues.map(issue => `${issue.field}: ${issue.message}`).join(' '),
        data: { issues: reply.issues },
      })
    return reply
  }
  finally {
    giveSlot()
    void worker.terminate()
  }
}
