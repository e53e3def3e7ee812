import { issuesOf, type FieldIssue } from '~/utils/releaseDraft'

export interface SubmitOptions {
  /** Words a refusal for the form's alert; the API's own message (useApiError) unless given. */
  describe?: (failure: unknown) => string
}

/**
 * The state every form shares while it talks to the API, so no form keeps a try/catch of its own:
 * whether it is working, whether the last request succeeded (`done`), the message to show when the API
 * refuses (which always says what to fix), the refusal itself (`failure`) and its field issues, for the
 * messages beside each field (`useFieldIssues`). Only the latest request speaks: one started after it
 * drops its outcome, so a slow early answer never overwrites a newer one.
 */
export function useSubmit(options: SubmitOptions = {}) {
  const describe = options.describe ?? useApiError()
  const error = ref('')
  const issues = ref<FieldIssue[]>([])
  const failure = shallowRef<unknown>(null)
  const working = ref(false)
  const done = ref(false)
  let latest = 0

  /** Forgets what the last request said (a changed input is a new attempt). */
  function clear() {
    error.value = ''
    issues.value = []
    failure.value = null
    done.value = false
  }

  /** Runs a request; resolves true when it succeeded, false when the error is shown or a newer request took over. */
  async function run(request: () => Promise<unknown>): Promise<boolean> {
    const ticket = ++latest
    clear()
    working.value = true
    try {
      await request()
      if (ticket !== latest) return false
      done.value = true
      return true
    }
    catch (refusal) {
      if (ticket !== latest) return false
      failure.value = refusal
      issues.value = issuesOf(refusal)
      error.value = describe(refusal)
      return false
    }
    finally {
      if (ticket === latest) working.value = false
    }
  }

  /** Shows what a check made before sending found; false, so a handler can `return fail(…)`. */
  function fail(message: string, found: FieldIssue[] = []): false {
    clear()
    error.value = message
    issues.value = found
    return false
  }

  /** Forgets the request in flight, if any, and what the last one said. */
  function abandon() {
    latest++
    working.value = false
    clear()
  }

  return { error, issues, failure, working, done, run, fail, clear, abandon }
}
