/** The token an e-mailed link carries in `?token=`, or '' when the link was cut short. */
export function useLinkToken() {
  const route = useRoute()
  return computed(() => {
    const value = route.query.token
    return typeof value === 'string' && /^[\w-]{20,64}$/.test(value) ? value : ''
  })
}
