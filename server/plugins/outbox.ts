/** The outbox worker: what is due is sent every few seconds (and at once after each message is queued). */
export default defineNitroPlugin((nitroApp) => {
  // Not for a one-off task (scripts/task.mjs): it exits when done.
  if (process.env.CHARGEWELL_TASK) return
  const every = Math.min(5000, Number(useRuntimeConfig().outboxRetrySeconds) * 1000 || 5000)
  const timer = setInterval(() => void kickOutbox(), every)
  timer.unref()
  nitroApp.hooks.hook('close', () => clearInterval(timer))
})
