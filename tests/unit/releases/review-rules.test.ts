import { describe, expect, it } from 'vitest'
import { availableActions, judgeEdit, judgeReviewAction } from '../../../shared/review/rules'

const author = { id: 'author', role: 'analyst' }
const colleague = { id: 'colleague', role: 'analyst' }
const planner = { id: 'planner', role: 'planner' }
const at = (state: 'draft' | 'in-review' | 'published' | 'superseded' | 'withdrawn') => ({
  state,
  authorId: 'author',
  version: 2,
})

describe('the review workflow', () => {
  it('moves draft → in review → published, and back to draft when returned', () => {
    expect(judgeReviewAction('submit', at('draft'), author)).toEqual({ ok: true, to: 'in-review' })
    expect(judgeReviewAction('approve', at('in-review'), colleague)).toEqual({ ok: true, to: 'published' })
    expect(judgeReviewAction('return', at('in-review'), colleague)).toEqual({ ok: true, to: 'draft' })
    expect(judgeReviewAction('withdraw', at('published'), author)).toEqual({ ok: true, to: 'withdrawn' })
    expect(judgeReviewAction('withdraw', at('superseded'), author)).toEqual({ ok: true, to: 'withdrawn' })
  })

  it('never lets the author approve their own version', () => {
    expect(judgeReviewAction('approve', at('in-review'), author)).toMatchObject({ ok: false, status: 403 })
    expect(availableActions(at('in-review'), author)).toEqual(['return'])
    expect(availableActions(at('in-review'), colleague)).toEqual(['approve', 'return'])
  })

  it('never lets a colleague who changed the content approve it either', () => {
    const edited = { ...at('in-review'), coauthorIds: ['colleague'] }
    expect(judgeReviewAction('approve', edited, colleague)).toMatchObject({
      ok: false,
      status: 403,
      message: expect.stringMatching(/one of its authors/),
    })
    expect(availableActions(edited, colleague)).toEqual(['return'])
    expect(judgeReviewAction('approve', edited, { id: 'third', role: 'analyst' })).toEqual({
      ok: true,
      to: 'published',
    })
  })

  it('answers a step from the wrong state with 409 saying what state it is in', () => {
    expect(judgeReviewAction('approve', at('draft'), colleague)).toEqual({
      ok: false,
      status: 409,
      message: 'Version 2 is a draft; only a version that is in review can be approved.',
    })
    expect(judgeReviewAction('submit', at('withdrawn'), author)).toMatchObject({ ok: false, status: 409 })
  })

  it('lets only analysts act, and only drafts be edited', () => {
    expect(judgeReviewAction('submit', at('draft'), planner)).toMatchObject({ ok: false, status: 403 })
    expect(availableActions(at('published'), planner)).toEqual([])
    expect(judgeEdit(at('draft'), author)).toMatchObject({ ok: true })
    expect(judgeEdit(at('published'), author)).toMatchObject({ ok: false, status: 409 })
  })
})
