import { ENGINE_VERSION } from '../../shared/gas/version'

/** Liveness and database check; the only route open without a session. */
export default defineEventHandler(async () => {
  const sequelize = await useDB()
  await sequelize.query('SELECT 1')
  return { status: 'ok', database: 'ok', engineVersion: ENGINE_VERSION, time: new Date().toISOString() }
})
