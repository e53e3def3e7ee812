import { execFile } from 'node:child_process'
import { resolve } from 'node:path'
import { ROOT } from './server'

export interface CliResult { code: number, stdout: string, stderr: string }

/** Runs one of the `server/db/cli` scripts as `npm run db:*` would, with the given environment. */
export function runDbCli(
  script: 'backup' | 'restore' | 'migrate' | 'reset',
  args: string[],
  env: Record<string, string>,
): Promise<CliResult> {
  return new Promise((done) => {
    execFile(
      resolve(ROOT, 'node_modules/.bin/tsx'),
      [resolve(ROOT, `server/db/cli/${script}.ts`), ...args],
      {
        cwd: ROOT,
        env: { ...process.env, DATABASE_URL: '', ...env },
      },
      (error, stdout, stderr) => {
        done({ code: error ? (typeof error.code === 'number' ? error.code : 1) : 0, stdout, stderr })
      },
    )
  })
}
