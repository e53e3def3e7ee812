import { choleskySemiDefinite, correlationShapeIssues } from './correlation'
import { EngineInputError, formatPath, type EngineInputIssue } from './errors'
import { releaseSchema, type ParsedRelease } from './schema'

// Checks a release on its own — what an analyst must fix before it can be published — apart from
// the checks that relate it to one outlook (validate.ts).

export function checkStrictlyIncreasing(
  values: number[],
  path: string,
  what: string,
  issues: EngineInputIssue[],
): void {
  for (let i = 1; i < values.length; i++) {
    if (!(values[i]! > values[i - 1]!)) {
      issues.push({ path, message: `${what} must be strictly increasing: ${values[i]} follows ${values[i - 1]}` })
      return
    }
  }
}

/** A field path below `path` (which may be empty). */
const at = (path: string, field: string) => (path ? `${path}.${field}` : field)

/** Everything wrong with a parsed release's own consistency; empty when it is sound. */
export function releaseIssues(release: ParsedRelease, path: string): EngineInputIssue[] {
  const issues: EngineInputIssue[] = []
  const anchors = release.anchorYears
  checkStrictlyIncreasing(anchors, at(path, 'anchorYears'), 'anchor years', issues)
  if (anchors[0]! <= release.baselineYear) {
    issues.push({
      path: at(path, 'anchorYears'),
      message: `first anchor year ${anchors[0]} must come after the release's baseline year ${release.baselineYear} (rise is zero there)`,
    })
  }
  const perAnchor = (values: unknown[], field: string) => {
    if (values.length !== anchors.length) {
      issues.push({
        path: at(path, field),
        message: `needs one entry per anchor year (${anchors.length}), got ${values.length}`,
      })
    }
  }
  switch (release.form) {
    case 'normal':
      perAnchor(release.mean, 'mean')
      perAnchor(release.sd, 'sd')
      break
    case 'lognormal':
      perAnchor(release.shift, 'shift')
      perAnchor(release.mu, 'mu')
      perAnchor(release.sigma, 'sigma')
      break
    case 'quantiles': {
      const levels = release.levels
      const outside = levels.find(level => !(level > 0 && level < 1))
      if (outside !== undefined) {
        issues.push({
          path: at(path, 'levels'),
          message: `must be strictly increasing in (0,1): ${outside} is outside`,
        })
      }
      else {
        for (let k = 1; k < levels.length; k++) {
          if (!(levels[k]! > levels[k - 1]!)) {
            issues.push({
              path: at(path, 'levels'),
              message: `must be strictly increasing in (0,1): ${levels[k]} follows ${levels[k - 1]}`,
            })
            break
          }
        }
      }
      perAnchor(release.values, 'values')
      release.values.forEach((row, a) => {
        if (row.length !== levels.length) {
          issues.push({
            path: at(path, `values[${a}]`),
            message: `needs one value per probability level (${levels.length}), got ${row.length}`,
          })
          return
        }
        for (let k = 1; k < row.length; k++) {
          if (row[k]! < row[k - 1]!) {
            issues.push({
              path: at(path, `values[${a}]`),
              message: `must be non-decreasing across levels: ${row[k]} (level ${levels[k]}) follows ${row[k - 1]} (level ${levels[k - 1]})`,
            })
            break
          }
        }
      })
      break
    }
    case 'samples':
      release.draws.forEach((draw, d) => {
        if (draw.length !== anchors.length) {
          issues.push({
            path: at(path, `draws[${d}]`),
            message: `needs one value per anchor year (${anchors.length}), got ${draw.length}`,
          })
        }
      })
      break
  }
  return issues
}

/** Parses and checks one release; throws EngineInputError naming each field to fix. */
export function validateRelease(raw: unknown, path = 'release'): ParsedRelease {
  const parsed = releaseSchema.safeParse(raw)
  if (!parsed.success) {
    throw new EngineInputError(parsed.error.issues.map(issue => ({
      path: formatPath([...(path ? path.split('.') : []), ...issue.path]),
      message: issue.message,
    })))
  }
  const issues = releaseIssues(parsed.data, path)
  if (issues.length) throw new EngineInputError(issues)
  return parsed.data
}

/**
 * Checks a correlation matrix between named components on its own (symmetric, unit diagonal,
 * positive semi-definite), with messages naming the components; throws EngineInputError.
 */
export function validateCorrelationMatrix(matrix: number[][], keys: string[], path = 'matrix'): void {
  const issues = correlationShapeIssues(matrix, keys.length, path)
  if (!issues.length) {
    const result = choleskySemiDefinite(matrix)
    if ('failsAtRow' in result) {
      issues.push({
        path,
        message: `not positive semi-definite (no set of scores can have these correlations; the check fails at row ${result.failsAtRow}, ${keys[result.failsAtRow]}); weaken the conflicting correlations`,
      })
    }
  }
  if (issues.length) throw new EngineInputError(issues)
}
