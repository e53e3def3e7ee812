import { readFileSync } from 'node:fs'
import { createServer } from 'node:http'
import type { AddressInfo } from 'node:net'
import { createApp, eventHandler, toNodeListener, type H3Event } from 'h3'
import { describe, expect, it } from 'vitest'

// server/plugins/shared-page-cache.ts answers cached shared pages by replacing nitroApp.h3App.handler,
// the one framework internal the app leans on: no public hook runs before Nitro's `request` hooks, and
// paying for them (i18n and nuxt-security set up every request there) puts the shared page's p95 past
// its 100 ms target under `npm run load` (DEVELOPERS.md → Performance). These checks fail, naming
// the internal and the installed versions, when an upgrade changes what that file relies on.

const version = (name: string) =>
  JSON.parse(readFileSync(new URL(`../../../node_modules/${name}/package.json`, import.meta.url), 'utf8'))
    .version as string
const INTERNAL = `h3 ${version('h3')} / nitropack ${version('nitropack')}: server/plugins/shared-page-cache.ts replaces nitroApp.h3App.handler`
const RECHECK = 'Re-check that file against this version (measure with `npm run load`), then update this test.'

async function answer(app: ReturnType<typeof createApp>) {
  const server = createServer(toNodeListener(app))
  await new Promise<void>(resolve => server.listen(0, '127.0.0.1', resolve))
  try {
    const response = await fetch(`http://127.0.0.1:${(server.address() as AddressInfo).port}/shared/token`)
    return await response.text()
  }
  finally {
    server.close()
  }
}

describe('the framework internal behind the shared-page cache', () => {
  it('Nitro\'s node server still serves nitroApp.h3App through h3\'s toNodeListener', () => {
    const entry = readFileSync(
      new URL('../../../node_modules/nitropack/dist/presets/node/runtime/node-server.mjs', import.meta.url),
      'utf8',
    )
    expect(
      entry.includes('toNodeListener(nitroApp.h3App)'),
      `${INTERNAL}, and Nitro's node-server entry no longer serves nitroApp.h3App with toNodeListener. ${RECHECK}`,
    ).toBe(true)
  })

  it('a replaced app.handler answers before the app\'s request hook, and the original still runs it', async () => {
    const seen: string[] = []
    const app = createApp({ onRequest: () => { seen.push('request hook') } })
    app.use(eventHandler(() => 'rendered'))
    const handleRequest = app.handler
    app.handler = eventHandler(async (event: H3Event) => {
      if (event.path === '/shared/token' && seen.length === 0) {
        seen.push('cache')
        event.node.res.end('cached')
        return
      }
      return handleRequest(event)
    })

    const first = await answer(app)
    expect(first, `${INTERNAL}, and h3's node listener no longer calls app.handler for each request. ${RECHECK}`).toBe(
      'cached',
    )
    expect(seen, `${INTERNAL} to answer before Nitro's request hooks, and h3 now runs them first. ${RECHECK}`).toEqual([
      'cache',
    ])

    const second = await answer(app)
    expect(second, `${INTERNAL} and falls back on the handler it replaced, which no longer renders. ${RECHECK}`).toBe(
      'rendered',
    )
    expect(seen).toEqual(['cache', 'request hook'])
  })
})
