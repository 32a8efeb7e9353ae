import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * A fleet's records for years. Indexes behind every list order and filter and every foreign
 * key; the columns the worksheet list shows, frozen on the row so the list never reads the JSON
 * content; prefix search on work order, registration, serial and part number, case-insensitive
 * on both databases; the normalised pre-charge readings stored at release and each unit's trend
 * kept up to date, so reading the trends costs nothing; and one open alert per flag, enforced by
 * the database, so a flag mails once even with two servers.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  const postgres = sequelize.getDialect() === 'postgres'

  for (const [column, type] of [
    ['registration', DataTypes.STRING(20)],
    ['fleet_number', DataTypes.STRING(20)],
    ['position', DataTypes.STRING(80)],
    ['part_number', DataTypes.STRING(60)],
    ['serial_number', DataTypes.STRING(60)],
    ['as_found_verdict', DataTypes.STRING(12)],
    ['as_left_verdict', DataTypes.STRING(12)],
  ] as const)
    await queryInterface.addColumn('worksheets', column, { type, allowNull: true })
  const json = (path: string, column = 'content') =>
    postgres ? `(${column}::json #>> '{${path.split('.').join(',')}}')` : `json_extract(${column}, '$.${path}')`
  await sequelize.query(`UPDATE worksheets SET
    registration = ${json('aircraft.registration')}, fleet_number = ${json('aircraft.fleetNumber')}, position = ${json('accumulator.position')},
    part_number = ${json('accumulator.partNumber')}, serial_number = ${json('accumulator.serialNumber')},
    as_found_verdict = ${json('asFound.assessment.verdict', 'results')}, as_left_verdict = ${json('asLeft.assessment.verdict', 'results')}`)

  const index = (table: string, fields: string[], name?: string) =>
    queryInterface.addIndex(table, fields, name ? { name } : {})
  await index('worksheets', ['created_at', 'id'])
  await index('worksheets', ['performed_at', 'id'])
  await index('worksheets', ['work_order', 'id'])
  await index('worksheets', ['state', 'created_at', 'id'])
  await index('worksheets', ['aircraft_id', 'created_at'])
  await index('worksheets', ['accumulator_id', 'performed_at'])
  await index('worksheets', ['performer_id', 'created_at'])
  await index('worksheets', ['specification_id'])
  await index('worksheets', ['corrects_id'])
  await index('worksheets', ['voided_by_id'])
  // Case-insensitive prefix search: an index on the lower-cased value (text_pattern_ops so
  // PostgreSQL uses it for LIKE 'prefix%' whatever the database's collation).
  for (const column of ['work_order', 'registration', 'serial_number', 'part_number']) {
    await sequelize.query(
      `CREATE INDEX worksheets_${column}_search ON worksheets (lower(${column})${postgres ? ' text_pattern_ops' : ''})`,
    )
  }
  await index('signatures', ['user_id'])
  await index('attachments', ['worksheet_id'])
  await index('attachments', ['uploaded_by_id'])
  await index('accumulators', ['aircraft_id'])
  await index('accumulator_installations', ['accumulator_id'])
  await index('accumulator_installations', ['aircraft_id'])
  await index('specification_table_points', ['specification_id'])
  await index('specifications', ['status', 'part_number'])
  await index('specifications', ['supersedes_id'])
  await index('cycle_checks', ['accumulator_id'])
  await index('cycle_checks', ['recorded_by_id'])
  await index('sizing_studies', ['specification_id'])
  await index('sizing_studies', ['created_by_id'])
  await index('sizing_studies', ['updated_by_id'])
  await index('sizing_studies', ['updated_at'])
  await index('notifications', ['worksheet_id'])
  await index('notifications', ['created_at'])
  await index('audit_events', ['actor_id'])
  await index('aircraft', ['type'])
  await index('aircraft', ['base'])
  await index('tools', ['kind', 'calibration_due'])

  await queryInterface.createTable('precharge_readings', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false },
    accumulator_id: {
      type: DataTypes.INTEGER,
      allowNull: false,
      references: { model: 'accumulators', key: 'id' },
      onDelete: 'CASCADE',
    },
    worksheet_id: {
      type: DataTypes.INTEGER,
      allowNull: false,
      references: { model: 'worksheets', key: 'id' },
      onDelete: 'CASCADE',
    },
    kind: { type: DataTypes.STRING(10), allowNull: false },
    action: { type: DataTypes.STRING(10), allowNull: false },
    taken_at: { type: DataTypes.DATE, allowNull: false },
    reading: { type: DataTypes.JSON, allowNull: false },
    starts_segment: { type: DataTypes.BOOLEAN, allowNull: false },
    specification_id: {
      type: DataTypes.INTEGER,
      allowNull: true,
      references: { model: 'specifications', key: 'id' },
      onDelete: 'SET NULL',
    },
    normalised: { type: DataTypes.FLOAT, allowNull: true },
  })
  await index('precharge_readings', ['accumulator_id', 'taken_at'])
  await index('precharge_readings', ['worksheet_id'])
  await index('precharge_readings', ['specification_id'])

  await queryInterface.createTable('unit_trends', {
    accumulator_id: {
      type: DataTypes.INTEGER,
      primaryKey: true,
      allowNull: false,
      references: { model: 'accumulators', key: 'id' },
      onDelete: 'CASCADE',
    },
    specification_id: {
      type: DataTypes.INTEGER,
      allowNull: true,
      references: { model: 'specifications', key: 'id' },
      onDelete: 'SET NULL',
    },
    fit: { type: DataTypes.JSON, allowNull: true },
    flag: { type: DataTypes.JSON, allowNull: false },
    loss_per_day: { type: DataTypes.FLOAT, allowNull: true },
    flagged: { type: DataTypes.BOOLEAN, allowNull: false },
    services: { type: DataTypes.INTEGER, allowNull: false },
    last_service_at: { type: DataTypes.DATE, allowNull: true },
    computed_at: { type: DataTypes.DATE, allowNull: false },
  })
  await index('unit_trends', ['loss_per_day'])

  // One open alert per flag. Duplicates left by racing readers of the old code are closed first.
  await sequelize.query(`UPDATE trend_alerts SET cleared_at = raised_at WHERE cleared_at IS NULL AND id NOT IN (
    SELECT keep FROM (SELECT MIN(id) AS keep FROM trend_alerts WHERE cleared_at IS NULL GROUP BY subject) AS kept)`)
  await queryInterface.addIndex('trend_alerts', ['subject'], {
    unique: true,
    where: { cleared_at: null },
    name: 'trend_alerts_one_open_per_subject',
  })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeIndex('trend_alerts', 'trend_alerts_one_open_per_subject')
  await queryInterface.dropTable('unit_trends')
  await queryInterface.dropTable('precharge_readings')
  for (const column of ['work_order', 'registration', 'serial_number', 'part_number'])
    await queryInterface.sequelize.query(`DROP INDEX worksheets_${column}_search`)
  for (const column of [
    'registration',
    'fleet_number',
    'position',
    'part_number',
    'serial_number',
    'as_found_verdict',
    'as_left_verdict',
  ]) {
    await queryInterface.removeColumn('worksheets', column)
  }
}
