import { appendAll } from './arrays'
import { choleskySemiDefinite, correlationShapeIssues } from './correlation'
import { EngineInputError, formatPath, type EngineInputIssue } from './errors'
import { checkStrictlyIncreasing, releaseIssues } from './release-validation'
import { MAX_HEIGHTS, outlookInputSchema, type ParsedOutlookInput, type ParsedRelease } from './schema'
import { LAND_MOTION_KEY } from './types'

/** A checked input with the height grid spelled out and the correlation factorised. */
export interface ValidatedOutlookInput extends Omit<ParsedOutlookInput, 'heights'> {
  heights: number[]
  choleskyFactor: Float64Array | null
}

const HEIGHT_DECIMALS = 1e9

/** Grid heights from a range; rounded so 0.05·3 reads 0.15, not 0.15000000000000002. */
export function expandHeightRange(range: { from: number, to: number, step: number }): number[] {
  const count = Math.floor((range.to - range.from) / range.step + 1e-9) + 1
  const heights: number[] = []
  for (let i = 0; i < count && i <= MAX_HEIGHTS; i++) {
    heights.push(Math.round((range.from + i * range.step) * HEIGHT_DECIMALS) / HEIGHT_DECIMALS)
  }
  return heights
}

function checkRelease(
  release: ParsedRelease,
  path: string,
  label: string,
  input: ParsedOutlookInput,
  issues: EngineInputIssue[],
): void {
  appendAll(issues, releaseIssues(release, path))
  const anchors = release.anchorYears
  if (release.baselineYear > input.baselineYear) {
    issues.push({
      path: `${path}.baselineYear`,
      message: `${label}: the release starts at ${release.baselineYear}, after the outlook's baseline year ${input.baselineYear}; use an outlook baseline on or after the release's`,
    })
  }
  const lastAnchor = anchors[anchors.length - 1]!
  const lastYear = input.years[input.years.length - 1]!
  if (lastYear > lastAnchor) {
    issues.push({
      path: 'years',
      message: `${label}: year ${lastYear} is past the release's last anchor year ${lastAnchor}; releases are never extrapolated — end the outlook by ${lastAnchor} or use a release that reaches ${lastYear}`,
    })
  }
}

/**
 * A flood level is compared with the total water level, so it needs the Gumbel statistics; a design life
 * belongs to a flood level and runs over the annual maxima of years lifeStartYear … lifeStartYear + L − 1,
 * which must lie between the baseline year and the last output year (the rise is known only there).
 */
function thresholdIssues(input: ParsedOutlookInput): EngineInputIssue[] {
  const issues: EngineInputIssue[] = []
  const lastYear = input.years[input.years.length - 1]!
  input.thresholds.forEach((threshold, i) => {
    const path = `thresholds[${i}]`
    const life = threshold.designLifeYears
    const start = threshold.lifeStartYear
    if (threshold.kind === 'flood-level' && !input.gumbel) {
      issues.push({
        path: `${path}.kind`,
        message:
          'a flood level compares the total water level (annual maximum plus rise) with the height, so it needs the site\'s extreme-water statistics (gumbel location and scale); add them or make it a mean-sea-level threshold',
      })
    }
    if (life !== undefined && threshold.kind === 'mean-sea-level') {
      issues.push({
        path: `${path}.designLifeYears`,
        message:
          'a design life counts floods over an asset\'s life, which a mean-sea-level threshold does not have; make it a flood level (kind "flood-level") or remove the design life',
      })
    }
    if (life !== undefined && start === undefined) {
      issues.push({
        path: `${path}.lifeStartYear`,
        message: 'is needed with designLifeYears: give the first year of the asset\'s life (its build year)',
      })
    }
    if (start !== undefined && life === undefined) {
      issues.push({
        path: `${path}.designLifeYears`,
        message: 'is needed with lifeStartYear: give the asset\'s design life in years, or remove lifeStartYear',
      })
    }
    if (start !== undefined && start < input.baselineYear) {
      issues.push({
        path: `${path}.lifeStartYear`,
        message: `the life would start in ${start}, before the reference epoch ${input.baselineYear} that heights and rise are counted from; start it in ${input.baselineYear} or later`,
      })
    }
    if (start !== undefined && life !== undefined) {
      const end = start + life - 1
      if (end > lastYear) {
        issues.push({
          path: `${path}.designLifeYears`,
          message: `the design life runs from ${start} to ${end}, after the last output year ${lastYear}; add output years up to ${end} or shorten the life`,
        })
      }
    }
  })
  return issues
}

/**
 * Land motion is a rate or draws; a joint link ties draw j to release draw j, so it needs draws on both
 * sides and as many of each.
 */
function landMotionIssues(input: ParsedOutlookInput): EngineInputIssue[] {
  const land = input.landMotion
  if (!land) return []
  if (land.rateMmPerYear === undefined && !land.draws) {
    return [{ path: 'landMotion.rateMmPerYear', message: 'is needed: give a rate in mm/yr (with its sigma) or draws of the rate' }]
  }
  const joint = land.jointWith
  if (joint === undefined) return []
  if (!land.draws) {
    return [{ path: 'landMotion.jointWith', message: 'links land-motion draws to a release\'s draws; give draws or remove jointWith' }]
  }
  const component = input.components.find(candidate => candidate.key === joint)
  if (!component) {
    const keys = input.components.map(candidate => `"${candidate.key}"`).join(', ')
    return [{ path: 'landMotion.jointWith', message: `names no component of this outlook ("${joint}"); use one of ${keys}, or remove jointWith` }]
  }
  const release = component.release
  if (release.form !== 'samples') {
    return [{
      path: 'landMotion.jointWith',
      message: `component "${joint}" has a ${release.form} release, not draws; a joint link needs a release given as draws (form "samples"), or remove jointWith`,
    }]
  }
  if (release.draws.length !== land.draws.length) {
    return [{
      path: 'landMotion.draws',
      message: `has ${land.draws.length} draws but the release of "${joint}" has ${release.draws.length}; give one land-motion draw per release draw (same draw index), or remove jointWith`,
    }]
  }
  return []
}

/** Decimal times carry rounding: a step within this of a whole number of steps is that number. */
const STEP_TOLERANCE = 1e-6

/**
 * Observed values pair up (one rise per time), come in time order on the record's steps, and lie
 * between the baseline year and the last output year: the rise is known only there.
 */
function observationIssues(input: ParsedOutlookInput): EngineInputIssue[] {
  const observed = input.observations
  if (!observed) return []
  const issues: EngineInputIssue[] = []
  if (observed.rise.length !== observed.times.length) {
    issues.push({
      path: 'observations.rise',
      message: `has ${observed.rise.length} values for ${observed.times.length} times; give one rise per time`,
    })
  }
  const lastYear = input.years[input.years.length - 1]!
  observed.times.forEach((time, i) => {
    const path = `observations.times[${i}]`
    if (time < input.baselineYear || time > lastYear) {
      issues.push({
        path,
        message: `${time} is outside ${input.baselineYear}–${lastYear}; give only values from the baseline year to the last output year`,
      })
    }
    if (i === 0) return
    const steps = (time - observed.times[i - 1]!) / observed.stepYears
    if (steps < 1 - STEP_TOLERANCE || Math.abs(steps - Math.round(steps)) > STEP_TOLERANCE) {
      issues.push({
        path,
        message: `must come a whole number of steps (${observed.stepYears} years) after the time before it (${observed.times[i - 1]}), in increasing order`,
      })
    }
  })
  return issues
}

/** Parses and checks an outlook request; throws EngineInputError listing every problem. */
export function validateOutlookInput(raw: unknown): ValidatedOutlookInput {
  const parsed = outlookInputSchema.safeParse(raw)
  if (!parsed.success) {
    throw new EngineInputError(
      parsed.error.issues.map(issue => ({ path: formatPath(issue.path), message: issue.message })),
    )
  }
  const input = parsed.data
  const issues: EngineInputIssue[] = []

  checkStrictlyIncreasing(input.years, 'years', 'output years', issues)
  if (input.years[0]! < input.baselineYear) {
    issues.push({
      path: 'years',
      message: `year ${input.years[0]} is before the baseline year ${input.baselineYear}; outlooks look forward from the baseline`,
    })
  }

  let heights: number[]
  if (Array.isArray(input.heights)) {
    heights = input.heights
    checkStrictlyIncreasing(heights, 'heights', 'heights', issues)
  }
  else {
    const range = input.heights
    if (range.to < range.from)
      issues.push({ path: 'heights.to', message: `must be at least heights.from (${range.from})` })
    heights = expandHeightRange(range)
  }
  if (heights.length > MAX_HEIGHTS) {
    issues.push({ path: 'heights', message: `must have at most ${MAX_HEIGHTS} heights; use a coarser step` })
  }

  const seen = new Set<string>()
  input.components.forEach((component, c) => {
    const label = `component ${c} (${component.key})`
    if (component.key === LAND_MOTION_KEY) {
      issues.push({
        path: `components[${c}].key`,
        message: `"${LAND_MOTION_KEY}" is reserved for the site's land motion`,
      })
    }
    else if (seen.has(component.key)) {
      issues.push({
        path: `components[${c}].key`,
        message: `duplicate component key "${component.key}"; each component appears once`,
      })
    }
    seen.add(component.key)
    checkRelease(component.release, `components[${c}].release`, label, input, issues)
  })

  let choleskyFactor: Float64Array | null = null
  if (input.correlation) {
    const shapeIssues = correlationShapeIssues(input.correlation, input.components.length)
    appendAll(issues, shapeIssues)
    if (!shapeIssues.length) {
      const result = choleskySemiDefinite(input.correlation)
      if ('failsAtRow' in result) {
        const key = input.components[result.failsAtRow]?.key ?? result.failsAtRow
        issues.push({
          path: 'correlation',
          message: `not positive semi-definite (no set of scores can have these correlations; the check fails at row ${result.failsAtRow}, ${key}); weaken the conflicting correlations`,
        })
      }
      else {
        choleskyFactor = result.factor
      }
    }
  }

  appendAll(issues, thresholdIssues(input))
  appendAll(issues, observationIssues(input))
  appendAll(issues, landMotionIssues(input))

  if (issues.length) throw new EngineInputError(issues)
  return { ...input, heights, choleskyFactor }
}
