/**
 * Marks the page as live (`<html data-hydrated>`) once Vue has taken over the server's HTML. Until
 * then a tap on a button does nothing and a typed value is replaced by the form's own when it
 * hydrates; the browser tests wait for this mark after every full page load instead of for a time.
 */
export default defineNuxtPlugin((nuxtApp) => {
  nuxtApp.hooks.hookOnce('app:suspense:resolve', () => {
    document.documentElement.dataset.hydrated = ''
  })
})
