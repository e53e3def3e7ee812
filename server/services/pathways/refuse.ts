/** A 400 naming the field and what to fix, shaped like readValidBody's. */
export function refuse(field: string, message: string): never {
  throw createError({ statusCode: 400, message: `${field}: ${message}`, data: { issues: [{ field, message }] } })
}
