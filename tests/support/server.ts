import { spawn, type ChildProcess } from 'node:child_process'
import { once } from 'node:events'
import { createServer } from 'node:net'
import { resolve } from 'node:path'

export const ROOT = resolve(import.meta.dirname, '../..')
export const SERVER_ENTRY = resolve(ROOT, '.output/server/index.mjs')

export interface RunningServer {
  url: string
  /** The server's process id (the load test reads its peak memory from /proc). */
  pid: number
  stop: () => Promise<void>
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
 * Starts the built server on a free loopback port with its own in-memory PGlite database,
 * seeded with the demo coast, and resolves once it answers its health check.
 */
export async function startServer(env: Record<string, string> = {}): Promise<RunningServer> {
  const port = await freePort()
  const url = `http://127.0.0.1:${port}`
  const child: ChildProcess = spawn(process.execPath, [SERVER_ENTRY], {
    cwd: ROOT,
    env: {
      ...process.env,
      NODE_ENV: 'production',
      HOST: '127.0.0.1',
      PORT: String(port),
      PGLITE_DATA_DIR: 'memory://',
      NUXT_SESSION_PASSWORD: 'test-session-password-at-least-32-characters-long',
      PRECOMPUTE_DEMO_OUTLOOKS: 'false',
      APP_URL: url,
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  })
  let output = ''
  child.stdout!.on('data', (chunk) => { output += chunk })
  child.stderr!.on('data', (chunk) => { output += chunk })

  const listening = new Promise<void>((resolveListening, reject) => {
    child.stdout!.on('data', () => { if (output.includes('Listening on')) resolveListening() })
    child.once('exit', code => reject(new Error(`The server exited with code ${code} before listening:\n${output}`)))
  })
  await listening

  // The health route waits for migration and seeding, so one answer means ready.
  const health = await fetch(`${url}/api/health`)
  if (!health.ok) throw new Error(`The server is not healthy (${health.status}):\n${output}`)

  return {
    url,
    pid: child.pid!,
    async stop() {
      if (child.exitCode !== null) return
      child.kill('SIGTERM')
      await once(child, 'exit')
    },
  }
}
