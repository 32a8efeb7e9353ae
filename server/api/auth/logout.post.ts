/** Signs out; harmless without a session. */
export default defineEventHandler(async (event) => {
  await clearUserSession(event)
  return { signedOut: true }
})
