import { spawn, type ChildProcess } from 'node:child_process'
import { once } from 'node:events'
import { readFileSync } from 'node:fs'
import { createServer } from 'node:net'
import { resolve } from 'node:path'
import { createTestDatabase, TEST_DATABASE_URL, type TestDatabase } from './database'

export { createTestDatabase, TEST_DATABASE_URL, type TestDatabase } from './database'

export const ROOT = resolve(import.meta.dirname, '../..')
export const SERVER_ENTRY = resolve(ROOT, '.output/server/index.mjs')
/** The Node options `npm start` runs the built server with (package.json `config`), so tests run it the same way. */
export const SERVER_NODE_OPTIONS: string[] = JSON.parse(
  readFileSync(resolve(ROOT, 'package.json'), 'utf8'),
).config.serverNodeOptions.split(' ')

export interface RunningServer {
  url: string
  /** The server's process id (the load test reads its peak memory from /proc). */
  pid: number
  stop: () => Promise<void>
  /** Resolves with the exit code (null when killed by a signal) once the process has ended. */
  exited: Promise<number | null>
  /** What the server has written to stdout and stderr so far. */
  output: () => string
}

export interface StartOptions {
  /** false: resolve once listening even if the health check answers 503 (database-fault tests). */
  requireHealthy?: boolean
}

async function freePort(): Promise<number> {
  const probe = createServer()
  probe.listen(0, '127.0.0.1')
  await once(probe, 'listening')
  const { port } = probe.address() as { port: number }
  probe.close()
  await once(probe, 'close')
  return port
}

/**
 * Starts the built server on a free loopback port with a database of its own, seeded with the
 * demo coast, and resolves once it answers its health check. The database is in-memory PGlite,
 * or, when BRINKWATER_TEST_DATABASE_URL is set, a fresh database on that PostgreSQL server,
 * dropped by `stop()`. Pass `DATABASE_URL` (from `createTestDatabase()`) to start several servers
 * on one database, or `PGLITE_DATA_DIR` for a PGlite folder; then the caller owns that database.
 */
export async function startServer(
  env: Record<string, string> = {},
  options: StartOptions = {},
): Promise<RunningServer> {
  const ownDatabase: TestDatabase | undefined
    = TEST_DATABASE_URL && !env.DATABASE_URL && !env.PGLITE_DATA_DIR ? await createTestDatabase() : undefined
  try {
    return await launch(env, ownDatabase, options.requireHealthy ?? true)
  }
  catch (error) {
    await ownDatabase?.drop()
    throw error
  }
}

async function launch(
  env: Record<string, string>,
  ownDatabase: TestDatabase | undefined,
  requireHealthy: boolean,
): Promise<RunningServer> {
  const port = await freePort()
  const url = `http://127.0.0.1:${port}`
  const child: ChildProcess = spawn(process.execPath, [...SERVER_NODE_OPTIONS, SERVER_ENTRY], {
    cwd: ROOT,
    env: {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      PGLITE_DATA_DIR: 'memory://',
      DATABASE_URL: ownDatabase?.url ?? '',
      NUXT_SESSION_PASSWORD: 'test-session-password-at-least-32-characters-long',
      PRECOMPUTE_DEMO_OUTLOOKS: 'false',
      APP_URL: url,
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  const exited = new Promise<number | null>(resolveExit => child.once('exit', code => resolveExit(code)))
  let output = ''
  child.stdout!.on('data', (chunk) => {
    output += chunk
  })
  child.stderr!.on('data', (chunk) => {
    output += chunk
  })

  const listening = new Promise<void>((resolveListening, reject) => {
    child.stdout!.on('data', () => {
      if (output.includes('Listening on')) resolveListening()
    })
    child.once('exit', code => reject(new Error(`The server exited with code ${code} before listening:\n${output}`)))
  })
  await listening

  // The health route waits for migration and seeding, so one answer means ready.
  const health = await fetch(`${url}/api/health`)
  if (requireHealthy && !health.ok) {
    await stopChild(child)
    throw new Error(`The server is not healthy (${health.status}):\n${output}`)
  }

  return {
    url,
    exited,
    output: () => output,
    pid: child.pid!,
    async stop() {
      await stopChild(child)
      await ownDatabase?.drop()
    },
  }
}

async function stopChild(child: ChildProcess) {
  if (child.exitCode !== null || child.signalCode !== null) return
  const exited = once(child, 'exit')
  child.kill('SIGTERM')
  await exited
}
