import { issuesOf, type FieldIssue } from '~/utils/releaseDraft'

/**
 * The state every form shares while it talks to the API: whether it is working, the message to show
 * when the API refuses (which always says what to fix), and the refusal's field issues, for the
 * messages beside each field.
 */
export function useSubmit() {
  const describeError = useApiError()
  const error = ref('')
  const issues = ref<FieldIssue[]>([])
  const working = ref(false)

  /** Runs a request; resolves true when it succeeded, false when the error is shown. */
  async function run(request: () => Promise<unknown>): Promise<boolean> {
    error.value = ''
    issues.value = []
    working.value = true
    try {
      await request()
      return true
    }
    catch (failure) {
      issues.value = issuesOf(failure)
      error.value = describeError(failure)
      return false
    }
    finally {
      working.value = false
    }
  }

  return { error, issues, working, run }
}
