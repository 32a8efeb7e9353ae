import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Each hydraulic system's pump-cycle trend kept up to date (baseline, latest, drop, flag), so the
 * Trends page reads one row per system instead of every check of the fleet (one system's checks in
 * date order are read by the index of 0002). Derived from the checks on the next start
 * (server/utils/db.ts).
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.createTable('cycle_trends', {
    aircraft_id: { type: DataTypes.INTEGER, allowNull: false, primaryKey: true, references: { model: 'aircraft', key: 'id' } },
    system: { type: DataTypes.STRING(80), allowNull: false, primaryKey: true },
    accumulator_id: { type: DataTypes.INTEGER, allowNull: false },
    registration: { type: DataTypes.STRING(20), allowNull: false },
    checks: { type: DataTypes.INTEGER, allowNull: false },
    baseline_seconds: { type: DataTypes.FLOAT, allowNull: true },
    latest_seconds: { type: DataTypes.FLOAT, allowNull: true },
    latest_leak_rate: { type: DataTypes.JSON, allowNull: true },
    drop: { type: DataTypes.FLOAT, allowNull: true },
    // The order of the table: the largest drop first, systems without one last (the drop is never below −1e9).
    rank: { type: DataTypes.FLOAT, allowNull: false },
    flagged: { type: DataTypes.BOOLEAN, allowNull: false },
    message: { type: DataTypes.TEXT, allowNull: true },
    first_checked_at: { type: DataTypes.DATE, allowNull: true },
    last_checked_at: { type: DataTypes.DATE, allowNull: true },
    computed_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.addIndex('cycle_trends', ['rank', 'aircraft_id', 'system'])
  await queryInterface.addIndex('cycle_trends', ['flagged'])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.dropTable('cycle_trends')
}
