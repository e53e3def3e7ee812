import type { ReviewState } from '../types/science'

// The review workflow of releases, correlation sets and scale-factor grids, as pure rules so the
// routes, the UI (which buttons to show) and the tests agree.

/** The kinds of record that go through review. */
export type ReviewedKind = 'release' | 'correlation-set' | 'scale-factor-grid' | 'storyline'

export const REVIEW_ACTIONS = ['submit', 'approve', 'return', 'withdraw'] as const
export type ReviewAction = typeof REVIEW_ACTIONS[number]

/** `coauthorIds`: everyone else who changed the version's content; like its author, none may approve it. */
export interface ReviewSubject {
  state: ReviewState
  authorId: string
  coauthorIds?: readonly string[]
  version: number
}
export interface ReviewActor { id: string, role: string }

export type ReviewVerdict
  = | { ok: true, to: ReviewState }
    | { ok: false, status: 403 | 409, message: string }

const FROM: Record<ReviewAction, { from: ReviewState[], to: ReviewState }> = {
  submit: { from: ['draft'], to: 'in-review' },
  approve: { from: ['in-review'], to: 'published' },
  return: { from: ['in-review'], to: 'draft' },
  withdraw: { from: ['published', 'superseded'], to: 'withdrawn' },
}

const ACTION_WORDS: Record<ReviewAction, string> = {
  submit: 'submitted for review',
  approve: 'approved',
  return: 'returned to its author',
  withdraw: 'withdrawn',
}

const STATE_WORDS: Record<ReviewState, string> = {
  'draft': 'a draft',
  'in-review': 'in review',
  'published': 'published',
  'superseded': 'superseded',
  'withdrawn': 'withdrawn',
}

/** May this analyst take this action on this record now? Organisation scoping is checked before. */
export function judgeReviewAction(action: ReviewAction, subject: ReviewSubject, actor: ReviewActor): ReviewVerdict {
  if (actor.role !== 'analyst') return { ok: false, status: 403, message: 'This needs the analyst role.' }
  const rule = FROM[action]
  if (!rule.from.includes(subject.state)) {
    const allowed = rule.from.map(state => STATE_WORDS[state]).join(' or ')
    return {
      ok: false,
      status: 409,
      message: `Version ${subject.version} is ${STATE_WORDS[subject.state]}; only a version that is ${allowed} can be ${ACTION_WORDS[action]}.`,
    }
  }
  if (action === 'approve' && subject.authorId === actor.id) {
    return { ok: false, status: 403, message: 'You wrote this version; another analyst must review and approve it.' }
  }
  // Two people must have looked at the content: whoever edited a colleague's draft wrote part of it.
  if (action === 'approve' && subject.coauthorIds?.includes(actor.id)) {
    return {
      ok: false,
      status: 403,
      message:
        'You changed this version\'s content, so you are one of its authors; an analyst who did not write it must review and approve it.',
    }
  }
  return { ok: true, to: rule.to }
}

/** Only drafts change; anything later is a new version. */
export function judgeEdit(subject: ReviewSubject, actor: ReviewActor): ReviewVerdict {
  if (actor.role !== 'analyst') return { ok: false, status: 403, message: 'This needs the analyst role.' }
  if (subject.state !== 'draft') {
    return {
      ok: false,
      status: 409,
      message: `Version ${subject.version} is ${STATE_WORDS[subject.state]} and can no longer be edited; start a new version instead.`,
    }
  }
  return { ok: true, to: 'draft' }
}

/** The actions to offer this person on this record (for the UI). */
export function availableActions(subject: ReviewSubject, actor: ReviewActor): ReviewAction[] {
  return REVIEW_ACTIONS.filter(action => judgeReviewAction(action, subject, actor).ok)
}
