import { accessSync, constants, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { mkdir, readFile, rm, writeFile } from 'node:fs/promises'
import { dirname, join, resolve } from 'node:path'

// PGlite is an embedded database: two processes opening one data folder corrupt it. PGlite's own
// postmaster.pid cannot tell (it names no real process, and a killed server leaves it behind), so
// the app keeps `<folder>.pid` beside the folder with its process id while it has the folder open.

export function lockFileOf(dataDir: string) {
  return `${resolve(dataDir)}.pid`
}

function isAlive(pid: number) {
  try {
    process.kill(pid, 0)
    return true
  }
  catch (error) {
    // EPERM: the process exists but belongs to someone else.
    return (error as NodeJS.ErrnoException).code === 'EPERM'
  }
}

/** The id of another live process holding the folder, if any. */
export async function dataDirHolder(dataDir: string): Promise<number | undefined> {
  const text = await readFile(lockFileOf(dataDir), 'utf8').catch(() => '')
  const pid = Number.parseInt(text, 10)
  if (!Number.isInteger(pid) || pid <= 0 || pid === process.pid) return undefined
  return isAlive(pid) ? pid : undefined
}

/** Marks the folder as ours, or refuses if a live process has it; resolves to the release. */
export async function claimDataDir(dataDir: string): Promise<() => Promise<void>> {
  const holder = await dataDirHolder(dataDir)
  if (holder) {
    throw new Error(
      `The PGlite data folder ${dataDir} is in use by process ${holder}. Stop that process first (only one process may open an embedded database), or set PGLITE_DATA_DIR to another folder.`,
    )
  }
  const lockFile = lockFileOf(dataDir)
  await mkdir(dirname(lockFile), { recursive: true })
  await mkdir(dataDir, { recursive: true })
  await writeFile(lockFile, `${process.pid}\n`)
  return async () => {
    const text = await readFile(lockFile, 'utf8').catch(() => '')
    if (Number.parseInt(text, 10) === process.pid) await rm(lockFile, { force: true })
  }
}

/**
 * Why this process cannot use the PGlite folder at all (another live process holds it, or it cannot
 * be created or written), checked synchronously at start so the server exits with the reason
 * instead of listening and answering 500. Undefined when it can.
 */
export function dataDirProblemSync(dataDir: string): string | undefined {
  const text = (() => {
    try {
      return readFileSync(lockFileOf(dataDir), 'utf8')
    }
    catch {
      return ''
    }
  })()
  const pid = Number.parseInt(text, 10)
  if (Number.isInteger(pid) && pid > 0 && pid !== process.pid && isAlive(pid)) {
    return `The PGlite data folder ${dataDir} is in use by process ${pid}. Stop that process first (only one process may open an embedded database), or set PGLITE_DATA_DIR to another folder.`
  }
  try {
    mkdirSync(dataDir, { recursive: true })
    accessSync(dataDir, constants.W_OK)
    const probe = join(dataDir, `.write-probe-${process.pid}`)
    writeFileSync(probe, '')
    rmSync(probe, { force: true })
    accessSync(dirname(lockFileOf(dataDir)), constants.W_OK)
  }
  catch (error) {
    return `The PGlite data folder ${dataDir} cannot be created or written (${(error as NodeJS.ErrnoException).code ?? String(error)}). Make it writable by this user, or set PGLITE_DATA_DIR to a folder that is.`
  }
  return undefined
}
