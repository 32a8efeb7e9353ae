import { mailExpiringAuthorisations } from '../services/authorisations'

const HOUR = 60 * 60 * 1000

/** Holders and administrators hear of an authorisation expiring within 30 days: checked at start and hourly. */
export default defineNitroPlugin((nitroApp) => {
  // Not for a one-off task (scripts/task.mjs): it exits when done.
  if (process.env.CHARGEWELL_TASK) return
  const check = async () => {
    if (!isReady()) return
    await useDB()
    await mailExpiringAuthorisations().catch(error => console.error('Authorisation expiry check failed:', error))
  }
  const first = setTimeout(() => void check(), 5_000)
  const timer = setInterval(() => void check(), HOUR)
  first.unref()
  timer.unref()
  nitroApp.hooks.hook('close', () => {
    clearTimeout(first)
    clearInterval(timer)
  })
})
