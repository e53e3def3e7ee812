/**
 * True when a write failed on a unique constraint (PostgreSQL code 23505), from either driver;
 * drizzle wraps the driver's error as its `cause`. Two people doing the same thing at the same
 * moment end here, and deserve a 409 that says so rather than a 500.
 */
export function isUniqueViolation(error: unknown): boolean {
  for (let e = error as { code?: unknown, cause?: unknown } | undefined; e; e = e.cause as typeof e) {
    if (e.code === '23505') return true
  }
  return false
}
