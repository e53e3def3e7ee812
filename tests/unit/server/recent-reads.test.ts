import { afterEach, describe, expect, it, vi } from 'vitest'
import { RECENT_READ_MS, forgetRecentReads, recentReads } from '../../../server/utils/recent-reads'

/** A read whose answers the test hands out one at a time, counting the queries made. */
function controlledRead() {
  const waiting: Array<{ key: string, answer: (n: number) => void, fail: (error: Error) => void }> = []
  let queries = 0
  const read = (key: string) => new Promise<{ key: string, n: number }>((answer, fail) => {
    queries++
    waiting.push({ key, answer: n => answer({ key, n }), fail })
  })
  return { read, waiting, queries: () => queries }
}

afterEach(() => { vi.useRealTimers() })

describe('recentReads (a read kept for a moment, dropped by any write)', () => {
  it('shares a pending read and keeps its answer for RECENT_READ_MS, then asks again', async () => {
    vi.useFakeTimers()
    const source = controlledRead()
    const read = recentReads(source.read)
    const first = read('user-1')
    const second = read('user-1')
    expect(source.queries()).toBe(1)
    source.waiting[0]!.answer(1)
    expect(await second).toBe(await first)
    vi.advanceTimersByTime(RECENT_READ_MS - 1)
    expect(await read('user-1')).toEqual({ key: 'user-1', n: 1 })
    expect(source.queries()).toBe(1)
    vi.advanceTimersByTime(1)
    const later = read('user-1')
    expect(source.queries()).toBe(2)
    source.waiting[1]!.answer(2)
    expect(await later).toEqual({ key: 'user-1', n: 2 })
  })

  it('forgets every kept answer at once when told, so a change through this instance is seen', async () => {
    const source = controlledRead()
    const read = recentReads(source.read)
    const before = read('site')
    source.waiting[0]!.answer(1)
    await before
    forgetRecentReads()
    const after = read('site')
    expect(source.queries()).toBe(2)
    source.waiting[1]!.answer(2)
    expect(await after).toEqual({ key: 'site', n: 2 })
  })

  it('neither shares nor keeps a read that was pending when told to forget: it may predate the change', async () => {
    const source = controlledRead()
    const read = recentReads(source.read)
    const early = read('user-1')
    forgetRecentReads()
    const late = read('user-1')
    expect(source.queries()).toBe(2)
    source.waiting[0]!.answer(1)
    source.waiting[1]!.answer(2)
    expect(await early).toEqual({ key: 'user-1', n: 1 })
    expect(await late).toEqual({ key: 'user-1', n: 2 })
    expect(await read('user-1')).toEqual({ key: 'user-1', n: 2 })
    expect(source.queries()).toBe(2)
  })

  it('keeps no failure, and freezes what every caller shares', async () => {
    const source = controlledRead()
    const read = recentReads(source.read)
    const failing = read('x')
    source.waiting[0]!.fail(new Error('database away'))
    await expect(failing).rejects.toThrow('database away')
    const retried = read('x')
    expect(source.queries()).toBe(2)
    source.waiting[1]!.answer(3)
    expect(Object.isFrozen(await retried)).toBe(true)
  })
})
