import type { BandsAtYear } from '#shared/releases/summary'
import type { ParsedRelease } from '#shared/engine'
import type { ReleaseWork } from '../workers/release-worker'
import { checkOffThread, type CheckReply, type CheckWording } from './checking-thread'

// A release's engine work runs off the request thread (server/workers/release-worker.ts), in turn with
// the other checks of what people send (checking-thread.ts): one analyst's large release must not
// freeze every other request.

interface Reply extends CheckReply {
  release?: ParsedRelease
  anchorYears?: number[]
  bands?: BandsAtYear[]
}

const RELEASE_WORDING: CheckWording = {
  crowded: 'Many releases are being checked just now. Try again in a minute.',
  overBudget: seconds =>
    `Checking this release took longer than ${seconds} s, so it was stopped. Send fewer draws or anchor years, or try again when the server is less busy.`,
}

const runReleaseWorker = (work: ReleaseWork) => checkOffThread<Reply>('release-worker', work, RELEASE_WORDING)

/** Builds and checks a release as entered and gives its bands; 400 naming the field, or 503. */
export async function releaseWork(
  work: Extract<ReleaseWork, { input: unknown }>,
): Promise<{ release: ParsedRelease, bands: BandsAtYear[] }> {
  const reply = await runReleaseWorker(work)
  if (!reply.release || !reply.bands) throw new Error(reply.error ?? 'The release worker gave no answer.')
  return { release: reply.release, bands: reply.bands }
}

/**
 * The editor's preview of a body exactly as sent: parsed, checked against the shared schema and
 * turned into bands on the worker, so even the largest release leaves this thread free.
 */
export async function previewReleaseBody(
  raw: string | undefined,
): Promise<{ anchorYears: number[], bands: BandsAtYear[] }> {
  const reply = await runReleaseWorker({ raw, years: 'preview' })
  if (!reply.anchorYears || !reply.bands) throw new Error(reply.error ?? 'The release worker gave no answer.')
  return { anchorYears: reply.anchorYears, bands: reply.bands }
}
