import { announceCalibrationsDue, kickWebhooks } from '../services/webhooks'

const HOUR = 60 * 60 * 1000

/**
 * The webhook worker: what is due is sent every few seconds (and at once after each event is queued);
 * gauges falling due for calibration are announced at start and hourly.
 */
export default defineNitroPlugin((nitroApp) => {
  // Not for a one-off task (scripts/task.mjs): it exits when done.
  if (process.env.CHARGEWELL_TASK) return
  const every = Math.min(5000, Number(useRuntimeConfig().webhookRetrySeconds) * 1000 || 5000)
  const send = setInterval(() => {
    if (isReady()) void kickWebhooks()
  }, every)
  const checkCalibrations = async () => {
    if (!isReady()) return
    await useDB()
    await announceCalibrationsDue().catch(error => console.error('Calibration due check failed:', error))
  }
  const first = setTimeout(() => void checkCalibrations(), 5_000)
  const hourly = setInterval(() => void checkCalibrations(), HOUR)
  for (const timer of [send, first, hourly]) timer.unref()
  nitroApp.hooks.hook('close', () => {
    clearInterval(send)
    clearTimeout(first)
    clearInterval(hourly)
  })
})
