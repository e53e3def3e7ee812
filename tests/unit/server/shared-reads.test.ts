import { describe, expect, it } from 'vitest'
import { sharedReads } from '../../../server/utils/shared-reads'

/** A read whose answers the test hands out one at a time, counting how many queries were made. */
function controlledRead() {
  const waiting: Array<{
    key: string
    answer: (value: { key: string, n: number }) => void
    fail: (error: Error) => void
  }> = []
  let queries = 0
  const read = (key: string) => new Promise<{ key: string, n: number }>((answer, fail) => {
    queries++
    waiting.push({ key, answer, fail })
  })
  return { read, waiting, queries: () => queries }
}

describe('sharedReads (one query for concurrent identical reads)', () => {
  it('gives callers that ask while a query is pending that query\'s answer', async () => {
    const source = controlledRead()
    const read = sharedReads(source.read)
    const first = read('user-1')
    const second = read('user-1')
    const other = read('user-2')
    expect(source.queries()).toBe(2)
    source.waiting[0]!.answer({ key: 'user-1', n: 1 })
    source.waiting[1]!.answer({ key: 'user-2', n: 2 })
    expect(await first).toEqual({ key: 'user-1', n: 1 })
    expect(await second).toBe(await first)
    expect(await other).toEqual({ key: 'user-2', n: 2 })
  })

  it('asks again once the query has settled, so a later change is seen', async () => {
    const source = controlledRead()
    const read = sharedReads(source.read)
    const before = read('site')
    source.waiting[0]!.answer({ key: 'site', n: 1 })
    await before
    const after = read('site')
    expect(source.queries()).toBe(2)
    source.waiting[1]!.answer({ key: 'site', n: 2 })
    expect((await after).n).toBe(2)
  })

  it('hands a failure to every caller waiting on it and forgets it', async () => {
    const source = controlledRead()
    const read = sharedReads(source.read)
    const first = read('x')
    const second = read('x')
    source.waiting[0]!.fail(new Error('connection lost'))
    await expect(first).rejects.toThrow('connection lost')
    await expect(second).rejects.toThrow('connection lost')
    const retry = read('x')
    expect(source.queries()).toBe(2)
    source.waiting[1]!.answer({ key: 'x', n: 3 })
    expect((await retry).n).toBe(3)
  })

  it('freezes the shared answer, so one caller cannot change what another sees', async () => {
    const read = sharedReads(async () => ({ name: 'Kelwick', tags: ['harbour'], nested: { level: 1 } }))
    const answer = await read('k')
    expect(() => { (answer as { name: string }).name = 'changed' }).toThrow(TypeError)
    expect(() => { answer.tags.push('more') }).toThrow(TypeError)
    expect(Object.isFrozen(answer.nested)).toBe(true)
  })
})
