import { mkdir, mkdtemp, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'

/**
 * Writes a server-asset folder out to a private temporary folder and returns its path, for
 * libraries that read files from disk (drizzle's migrator, PDFKit's fonts). The built server has
 * no source tree, so these files travel as Nitro server assets.
 */
export async function materialiseAssets(base: string) {
  const storage = useStorage(`assets:${base}`)
  const folder = await mkdtemp(join(tmpdir(), `brinkwater-${base}-`))
  for (const key of await storage.getKeys()) {
    const path = join(folder, ...key.split(':'))
    await mkdir(dirname(path), { recursive: true })
    const raw = await storage.getItemRaw(key)
    await writeFile(path, typeof raw === 'string' ? raw : Buffer.from(raw as ArrayBuffer))
  }
  return folder
}
