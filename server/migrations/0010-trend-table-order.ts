import type { QueryInterface } from 'sequelize'

/**
 * The pump-cycle trend table's order is the largest drop first, then aircraft and system ascending
 * (server/services/trends.ts). The index of 0008 holds all three ascending, so neither database could
 * read the mixed order from it and each page sorted every system of the fleet: 12 ms of each Trends
 * request at 8,334 systems. These hold the order as the page reads it, for all systems and for the
 * flagged ones.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  await sequelize.query('CREATE INDEX cycle_trends_table_order ON cycle_trends (rank DESC, aircraft_id, system)')
  await sequelize.query('CREATE INDEX cycle_trends_flagged_order ON cycle_trends (flagged, rank DESC, aircraft_id, system)')
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  await sequelize.query('DROP INDEX IF EXISTS cycle_trends_flagged_order')
  await sequelize.query('DROP INDEX IF EXISTS cycle_trends_table_order')
}
