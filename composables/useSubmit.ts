/**
 * The state every form shares while it talks to the API: whether it is working, and the
 * message to show when the API refuses (which always says what to fix).
 */
export function useSubmit() {
  const describeError = useApiError()
  const error = ref('')
  const working = ref(false)

  /** Runs a request; resolves true when it succeeded, false when the error is shown. */
  async function run(request: () => Promise<unknown>): Promise<boolean> {
    error.value = ''
    working.value = true
    try {
      await request()
      return true
    }
    catch (failure) {
      error.value = describeError(failure)
      return false
    }
    finally {
      working.value = false
    }
  }

  return { error, working, run }
}
