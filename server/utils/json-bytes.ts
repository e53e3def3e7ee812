import { promisify } from 'node:util'
import { gzip } from 'node:zlib'
import type { H3Event } from 'h3'

// Some answers are the same for every reader and large (a finished outlook's 120 kB result): they are
// serialised once and the same bytes are sent to each reader, instead of a fresh copy per request.
// A route that sends them still declares the JSON's shape as its return type, so Nitro's route types
// (and `useFetch` in the pages) see what the reader receives, not a Buffer.

declare const jsonOf: unique symbol
/** UTF-8 JSON made from a T, remembering the T (made only by jsonBytes or gzipJsonBytes). */
export type JsonBytes<T> = Buffer & { readonly [jsonOf]: T }

export function jsonBytes<T>(value: T): JsonBytes<T> {
  return Buffer.from(JSON.stringify(value)) as JsonBytes<T>
}

const gzipAsync = promisify(gzip)

/** The same JSON, gzip-encoded (sent with `content-encoding: gzip`). */
export async function gzipJsonBytes<T>(bytes: JsonBytes<T>): Promise<JsonBytes<T>> {
  return await gzipAsync(bytes) as JsonBytes<T>
}

/**
 * Answers with the bytes as they are (h3 sends a Buffer unchanged). Typed as the T they were made from:
 * this is the one place where bytes stand for the value, and jsonBytes is the only way to make them.
 */
export function sendJsonBytes<T>(event: H3Event, bytes: JsonBytes<T>): T {
  setResponseHeader(event, 'content-type', 'application/json')
  setResponseHeader(event, 'content-length', bytes.length)
  return bytes as unknown as T
}

/** 304 Not Modified: the status with no body (h3 answers a null return with none, keeping the status). */
export function sendNotModified<T>(event: H3Event): T {
  setResponseStatus(event, 304)
  return null as unknown as T
}

/** Whether the request accepts a gzip-encoded answer (`gzip` listed, not with q=0). */
export function acceptsGzip(event: H3Event): boolean {
  const header = getRequestHeader(event, 'accept-encoding') ?? ''
  return header.split(',').some((part) => {
    const [coding, ...parameters] = part.trim().toLowerCase().split(';').map(piece => piece.trim())
    if (coding !== 'gzip' && coding !== 'x-gzip' && coding !== '*') return false
    const q = parameters.find(p => p.startsWith('q='))
    return !q || Number(q.slice(2)) > 0
  })
}
