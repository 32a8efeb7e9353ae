/** With NUXT_FAKE_SMTP=fake (development, tests, demo) the app starts its own catching SMTP server. */
export default defineNitroPlugin(async () => {
  const config = useRuntimeConfig()
  // Not for a one-off task (scripts/task.mjs): nothing there sends mail.
  if (config.fakeSmtp !== 'fake' || config.smtpUrl || process.env.CHARGEWELL_TASK) return
  try {
    await startFakeSmtp(Number(config.fakeSmtpPort))
    console.info(`Fake SMTP server listening on 127.0.0.1:${config.fakeSmtpPort}; messages appear on the Outbox page.`)
  }
  catch (error) {
    console.error('The fake SMTP server could not start; e-mail will be recorded as failed.', error)
  }
})
