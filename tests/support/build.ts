import { execFileSync } from 'node:child_process'
import { ROOT } from './server'

// API tests run against the real built server. Build it first unless the caller has just
// built it (CI sets BRINKWATER_SKIP_BUILD=1 after `npm run build`).
export default function setup() {
  if (process.env.BRINKWATER_SKIP_BUILD === '1') return
  execFileSync(process.execPath, [`${ROOT}/node_modules/nuxt/bin/nuxt.mjs`, 'build'], { cwd: ROOT, stdio: 'inherit' })
}
