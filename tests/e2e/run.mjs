// `npm run test:e2e`: browser tests need Debian's Chromium; say so plainly when it is missing.
import { spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'

export const CHROMIUM = process.env.CHROMIUM_PATH || '/usr/bin/chromium'

if (!existsSync(CHROMIUM)) {
  console.error(
    `Chromium is not installed at ${CHROMIUM}. Install Debian's package: sudo apt-get install chromium (or set CHROMIUM_PATH).`,
  )
  process.exit(1)
}

const vitest = spawnSync(
  process.execPath,
  ['node_modules/vitest/vitest.mjs', 'run', '--project', 'e2e', ...process.argv.slice(2)],
  { stdio: 'inherit' },
)
process.exit(vitest.status ?? 1)
