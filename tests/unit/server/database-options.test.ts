import { sql } from 'drizzle-orm'
import { describe, expect, it } from 'vitest'
import { DEFAULT_PGLITE_SHARED_BUFFERS, databaseOptions, openDatabase } from '../../../server/db/client'
import { parseConfig } from '../../../server/utils/config'

describe('the embedded database\'s buffer pool (PGLITE_SHARED_BUFFERS)', () => {
  it('is read from the environment, and 32MB when unset', () => {
    expect(databaseOptions(parseConfig({ PGLITE_SHARED_BUFFERS: '48MB' })).sharedBuffers).toBe('48MB')
    expect(databaseOptions(parseConfig({})).sharedBuffers).toBe('32MB')
    expect(DEFAULT_PGLITE_SHARED_BUFFERS).toBe('32MB')
  })

  it.each(['lots', '32', '32 MB', '0MB', '-1GB', '32mb'])(
    'refuses %j with a message saying what to give',
    async (value) => {
      await expect(openDatabase({ dataDir: 'memory://', sharedBuffers: value })).rejects.toThrow(
        `PGLITE_SHARED_BUFFERS is "${value}": give a whole number with kB, MB or GB, such as 32MB.`,
      )
    },
  )

  it('is the setting the running database uses', async () => {
    const handle = await openDatabase({ dataDir: 'memory://', sharedBuffers: '16MB' })
    try {
      const result = await handle.db.execute(sql`show shared_buffers`) as unknown as { rows: unknown[] }
      expect(result.rows).toEqual([{ shared_buffers: '16MB' }])
    }
    finally {
      await handle.close()
    }
  }, 60_000)
})
