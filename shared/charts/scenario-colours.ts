import type { KNOWN_SCENARIOS } from '../types/science'

// One colour per scenario on every chart, page and PDF alike, whatever order the scenarios are
// chosen in: a reader who learnt "SSP5-8.5 is plum" on one chart can trust it on the next. Our own
// palette, each at least 3:1 against white (WCAG 1.4.11 for lines). A scenario an analyst names
// (a storyline) takes one of the spare colours by a hash of its name, so it too keeps its colour.

export const SCENARIO_COLOURS: Record<(typeof KNOWN_SCENARIOS)[number], string> = {
  'SSP1-1.9': '#2e7d5b',
  'SSP1-2.6': '#1f6f86',
  'SSP2-4.5': '#8a5a00',
  'SSP3-7.0': '#b93d2a',
  'SSP5-8.5': '#5b2a6e',
}

const SPARE = ['#0b1a23', '#31587a', '#7b6a45', '#9a3222', '#4a6b1f', '#6b4a8a'] as const

export function scenarioColour(scenario: string): string {
  const known = (SCENARIO_COLOURS as Record<string, string>)[scenario]
  if (known) return known
  let hash = 0
  for (const char of scenario) hash = (hash * 31 + char.codePointAt(0)!) >>> 0
  return SPARE[hash % SPARE.length]!
}
