import { DataTypes, type QueryInterface } from 'sequelize'

/** Pump cycle checks and the trend alerts already sent (so each new flag is mailed once). */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.createTable('cycle_checks', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false },
    aircraft_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'aircraft', key: 'id' }, onDelete: 'RESTRICT' },
    accumulator_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'accumulators', key: 'id' }, onDelete: 'RESTRICT' },
    system: { type: DataTypes.STRING(80), allowNull: false },
    checked_at: { type: DataTypes.DATE, allowNull: false },
    inputs: { type: DataTypes.JSON, allowNull: false },
    results: { type: DataTypes.JSON, allowNull: false },
    interval_seconds: { type: DataTypes.FLOAT, allowNull: false },
    engine_version: { type: DataTypes.STRING(20), allowNull: false },
    recorded_by_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    created_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.addIndex('cycle_checks', ['aircraft_id', 'system', 'checked_at'])
  await queryInterface.createTable('trend_alerts', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false },
    kind: { type: DataTypes.STRING(20), allowNull: false },
    subject: { type: DataTypes.STRING(120), allowNull: false },
    message: { type: DataTypes.TEXT, allowNull: false },
    raised_at: { type: DataTypes.DATE, allowNull: false },
    cleared_at: { type: DataTypes.DATE, allowNull: true },
  })
  await queryInterface.addIndex('trend_alerts', ['kind', 'subject'])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.dropTable('trend_alerts')
  await queryInterface.dropTable('cycle_checks')
}
