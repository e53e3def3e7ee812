/** One refused input: where it is (e.g. `components[2].release.levels`) and what to fix. */
export interface EngineInputIssue {
  path: string
  message: string
}

/** Thrown for every input the engine refuses; `issues` lists each problem found. */
export class EngineInputError extends Error {
  readonly issues: EngineInputIssue[]

  constructor(issues: EngineInputIssue[]) {
    const listed = issues.slice(0, 5).map(issue => `${issue.path || '(input)'}: ${issue.message}`)
    const more = issues.length > 5 ? ` (and ${issues.length - 5} more)` : ''
    super(listed.join('; ') + more)
    this.name = 'EngineInputError'
    this.issues = issues
  }
}

/** Formats a path like ['components', 2, 'release', 'levels'] as `components[2].release.levels`. */
export function formatPath(path: ReadonlyArray<PropertyKey>): string {
  let text = ''
  for (const part of path) {
    if (typeof part === 'number') text += `[${part}]`
    else text += text ? `.${String(part)}` : String(part)
  }
  return text
}
