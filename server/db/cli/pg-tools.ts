import { spawn } from 'node:child_process'

// pg_dump and pg_restore from PostgreSQL's client tools (Debian: postgresql-client). The password
// travels in PGPASSWORD, never on the command line, where other users could read it.

export function connectionFor(url: string) {
  const parsed = new URL(url)
  const password = decodeURIComponent(parsed.password)
  parsed.password = ''
  return { dbname: parsed.toString(), env: password ? { ...process.env, PGPASSWORD: password } : { ...process.env } }
}

export async function runPgTool(tool: 'pg_dump' | 'pg_restore', args: string[], url: string) {
  const { dbname, env } = connectionFor(url)
  const child = spawn(tool, [...args, `--dbname=${dbname}`], { env, stdio: ['ignore', 'inherit', 'pipe'] })
  let errors = ''
  child.stderr.on('data', (chunk) => { errors += chunk })
  const code = await new Promise<number | null>((resolve, reject) => {
    child.once('error', (error: NodeJS.ErrnoException) =>
      reject(
        error.code === 'ENOENT'
          ? new Error(
              `${tool} was not found. Install PostgreSQL's client tools, the server's major version or newer (Debian: apt install postgresql-client).`,
            )
          : error,
      ),
    )
    child.once('close', resolve)
  })
  if (code !== 0) throw new Error(`${tool} failed (exit ${code}):\n${errors.trim()}`)
}
