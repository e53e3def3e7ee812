import { storylineRise, type StorylineBasis } from '#shared/storylines/rise'
import type { BriefingStoryline } from '#shared/briefing/document'
import { publishedStorylines } from '../services/science-records'
import { recentReads } from '../utils/recent-reads'

/**
 * A crowd reading outlooks of one scenario shares one query for its storylines every RECENT_READ_MS;
 * a storyline published through this instance is seen at once.
 */
const storylinesOfScenario = recentReads(publishedStorylines)

/** A storyline as a briefing places it, with its id for the page's links. */
export interface OutlookStoryline extends BriefingStoryline { id: string }

/**
 * The scenario's published storylines placed at the outlook's site: read fresh on every request (a
 * storyline published later appears beside an outlook computed earlier), never part of the outlook.
 */
export async function storylinesAt(outlook: {
  scenario: string
  storylineBasis: StorylineBasis | null
}): Promise<OutlookStoryline[]> {
  if (!outlook.storylineBasis) return []
  const published = await storylinesOfScenario(outlook.scenario)
  return published.map(({ baselineYear, anchorYears, values, ...about }) => ({
    ...about,
    rises: storylineRise({ name: about.name, baselineYear, anchorYears, values }, outlook.storylineBasis!),
  }))
}
