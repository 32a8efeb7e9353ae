import { ENGINE_VERSION } from '#shared/gas/version'

/** Liveness, the database, and how long the event loop has been held up; the only route open without a session. */
export default defineEventHandler(async () => {
  const sequelize = await useDB()
  await sequelize.query('SELECT 1')
  return { status: 'ok', database: 'ok', engineVersion: ENGINE_VERSION, time: new Date().toISOString(), eventLoop: eventLoopDelay() }
})
