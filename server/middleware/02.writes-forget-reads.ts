import type { ServerResponse } from 'node:http'

// A request that may write (anything but GET, HEAD and OPTIONS: a user disabled, a session signed out,
// a site edited, science published or adopted) drops this instance's recently kept reads
// (server/utils/recent-reads.ts) once its work is done and before its answer leaves, so the next
// request, from this person or anyone, sees the change: a disabled user loses access at once. Done
// as the headers are written, because by then the handler's transaction has committed, whichever way
// it answered (a value, an error, a redirect).
const READ_ONLY = new Set(['GET', 'HEAD', 'OPTIONS'])

export default defineEventHandler((event) => {
  if (READ_ONLY.has(event.method)) return
  const res = event.node.res
  const writeHead = res.writeHead
  res.writeHead = function (this: ServerResponse, ...args: Parameters<ServerResponse['writeHead']>) {
    forgetRecentReads()
    return writeHead.apply(this, args)
  } as ServerResponse['writeHead']
})
