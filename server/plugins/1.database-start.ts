import { isPostgresUrl } from '../database/connection'
import { listenForSessionChanges } from '../database/session-broadcast'
import { Accumulator, CycleCheck, SystemCycleTrend, UnitTrend } from '../models'
import { rebuildCycleTrends } from '../services/trends'
import { rebuildTrends } from '../services/unit-trends'
import { forgetSessions, onSessionChangeBroadcast } from '../utils/session-store'

/**
 * What the server does once its database is open and before it serves anyone (server/utils/db.ts runs
 * these steps; named to load before any plugin that opens the database).
 */
export default defineNitroPlugin(() => {
  // Several servers on PostgreSQL: a session ended on one is forgotten by all (LISTEN/NOTIFY).
  onDatabaseStart(async ({ location }) => {
    if (isPostgresUrl(location)) onSessionChangeBroadcast(listenForSessionChanges(location, forgetSessions))
  })
  // Stored trends missing (a database from before them, or loaded in bulk): derive them once.
  onDatabaseStart(async ({ write }) => {
    if ((await UnitTrend.count()) === 0 && (await Accumulator.count()) > 0) {
      const released = await rebuildTrends(write)
      console.info(`Pre-charge trends derived from ${released} released worksheet(s).`)
    }
    if ((await SystemCycleTrend.count()) === 0 && (await CycleCheck.count({ where: { withdrawnAt: null } })) > 0) {
      const systems = await rebuildCycleTrends(write)
      console.info(`Pump-cycle trends derived for ${systems} system(s).`)
    }
  })
})
