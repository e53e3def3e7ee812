/** Marks the page as interactive; browser tests wait for it instead of guessing with sleeps. */
export function useHydrationMark() {
  onMounted(() => { document.documentElement.dataset.hydrated = 'true' })
}
