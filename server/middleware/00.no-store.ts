import type { ServerResponse } from 'node:http'

// Everything the app itself answers (signed-in pages, JSON, revocable shared pages, redirects) is
// private and may be revoked or changed at any moment, so no browser or proxy may keep a copy:
// `Cache-Control: private, no-store` unless a handler says otherwise, by setting its own header after
// this one: the map's style and land, and a finished outlook (GET /api/outlooks/[id]), which never
// changes, so it is `private, no-cache` with an ETag — the browser keeps it and asks again on every
// read (so a reader who lost access is still refused) and gets 304 instead of 120 kB. Running and
// failed outlooks keep this policy. Built files under /_nuxt are served before this runs and keep their
// long caching.
//
// nuxt-security writes the policy with a `{{nonce}}` placeholder before the handler runs and fills
// it in when a page is rendered. A response that renders no page (a redirect, an error answered
// early) would otherwise send the placeholder literally; it carries no scripts, so the nonce source
// is dropped just before the headers leave.
const PLACEHOLDER = /\s*'nonce-\{\{nonce\}\}'/g

function withoutPlaceholder(res: ServerResponse) {
  const policy = res.getHeader('content-security-policy')
  if (typeof policy === 'string' && policy.includes('{{nonce}}'))
    res.setHeader('content-security-policy', policy.replace(PLACEHOLDER, ''))
}

export default defineEventHandler((event) => {
  const res = event.node.res
  res.setHeader('cache-control', 'private, no-store')
  const writeHead = res.writeHead
  res.writeHead = function (this: ServerResponse, ...args: Parameters<ServerResponse['writeHead']>) {
    if (!this.headersSent) withoutPlaceholder(this)
    return writeHead.apply(this, args)
  } as ServerResponse['writeHead']
})
