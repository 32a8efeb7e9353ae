/**
 * Opens (and migrates) the database as the server starts, not on the first request, so the
 * first user does not wait for it. Requests that come earlier wait for the same opening.
 */
export default defineNitroPlugin(() => {
  // A restore opens its new database itself, once the copy is in place.
  if (process.env.CHARGEWELL_TASK === 'db:restore') return
  useDB().catch(error => console.error('The database could not be opened:', error))
})
