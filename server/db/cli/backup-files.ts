import { mkdir } from 'node:fs/promises'
import { resolve } from 'node:path'
import { serverConfig } from '../../utils/config'

/** Backups land here (gitignored) unless --out names a file. */
export const backupFolder = () => resolve(serverConfig().BACKUP_DIR)

/** 2026-12-02T00-35-12Z: sorts by time and is safe in every file system. */
export function timestamp(date = new Date()) {
  return date.toISOString().replace(/\.\d+Z$/, 'Z').replaceAll(':', '-')
}

export async function backupPath(kind: 'pglite' | 'postgresql', prefix = 'brinkwater') {
  await mkdir(backupFolder(), { recursive: true })
  return resolve(backupFolder(), `${prefix}-${timestamp()}.${kind === 'pglite' ? 'tar.gz' : 'dump'}`)
}

export interface CliArgs { positional: string[], force: boolean, out?: string }

export function parseArgs(argv = process.argv.slice(2)): CliArgs {
  const args: CliArgs = { positional: [], force: false }
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!
    if (arg === '--force') args.force = true
    else if (arg === '--out') args.out = argv[++i]
    else if (arg.startsWith('--out=')) args.out = arg.slice('--out='.length)
    else if (arg.startsWith('--')) throw new Error(`Unknown option ${arg}. Options: --force, --out <file>.`)
    else args.positional.push(arg)
  }
  return args
}

export function runCli(main: () => Promise<void>) {
  // If a library leaves a promise that never settles, Node exits on an empty event loop: that
  // must not look like success.
  let finished = false
  process.on('exit', (code) => {
    if (!finished && code === 0) {
      console.error('The command stopped before it finished; nothing was reported as done.')
      process.exitCode = 1
    }
  })
  main().then(() => { finished = true }, (error) => {
    finished = true
    console.error(error instanceof Error ? error.message : error)
    process.exit(1)
  })
}
