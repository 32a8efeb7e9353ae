/**
 * `CHARGEWELL_TASK=db:seed node .output/server/index.mjs` runs one Nitro task in the built server
 * and exits (scripts/task.mjs does this): the seed runs with the app's own services, database
 * connection and password hashing, and nothing waits for requests.
 */
export default defineNitroPlugin(() => {
  const name = process.env.CHARGEWELL_TASK
  if (!name) return
  runTask(name, { payload: {} })
    .then(({ result }) => {
      console.log(`${name}: ${JSON.stringify(result)}`)
      process.exit(0)
    })
    .catch((error) => {
      // A refusal in words (a damaged backup, a target that exists) needs no stack trace.
      if (error?.name === 'BackupRefused' || error?.cause?.name === 'BackupRefused') console.error(`${name} refused: ${error.cause?.message ?? error.message}`)
      else console.error(`${name} failed:`, error)
      process.exit(1)
    })
})
