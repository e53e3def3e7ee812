/**
 * Refreshes the data of the given keys that a page on screen is showing, now, and resolves when it
 * has arrived. Keys no page shows are left alone: the page that shows them next fetches them itself.
 *
 * This is `refreshNuxtData` without its first step, which waits for the browser to be idle
 * (`onNuxtReady` → `requestIdleCallback`). With a chart or map animating, Chromium may never give the
 * page an idle period, and a save would then never move on. A user action must not wait on that, so
 * the app calls the same `app:data:refresh` hook that `refreshNuxtData` calls, straight away.
 */
export function useRefreshData() {
  const nuxtApp = useNuxtApp()
  return (keys: string | string[]) =>
    nuxtApp.hooks.callHookParallel('app:data:refresh', Array.isArray(keys) ? keys : [keys])
}
