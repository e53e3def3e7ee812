/**
 * Freezes an object and everything it holds (a Map's values too; the Map itself stays writable, so
 * callers must still treat it as read-only). For values many requests share: code that tried to
 * change one for its own request fails loudly instead of leaking the change into other requests.
 */
export function deepFreeze<T>(value: T): T {
  if (!value || typeof value !== 'object' || Object.isFrozen(value)) return value
  Object.freeze(value)
  const children = value instanceof Map ? value.values() : Object.values(value)
  for (const child of children) deepFreeze(child)
  return value
}
