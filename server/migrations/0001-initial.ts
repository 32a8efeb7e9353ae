import { DataTypes, type QueryInterface } from 'sequelize'

const id = { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false }
const timestamps = {
  created_at: { type: DataTypes.DATE, allowNull: false },
  updated_at: { type: DataTypes.DATE, allowNull: false },
}
const reference = (table: string, allowNull = false, onDelete = 'RESTRICT') => ({
  type: DataTypes.INTEGER, allowNull, references: { model: table, key: 'id' }, onDelete,
})

/** The whole first schema, dialect-neutral (no SQLite-only SQL). */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.createTable('users', {
    id,
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    password_hash: { type: DataTypes.STRING(255), allowNull: false },
    roles: { type: DataTypes.JSON, allowNull: false },
    authorisation_number: { type: DataTypes.STRING(40), allowNull: true },
    disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
    preferences: { type: DataTypes.JSON, allowNull: false },
    ...timestamps,
  })
  await queryInterface.createTable('login_attempts', {
    id,
    email: { type: DataTypes.STRING(254), allowNull: false },
    succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
    at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.addIndex('login_attempts', ['email', 'at'])

  await queryInterface.createTable('aircraft', {
    id,
    registration: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    fleet_number: { type: DataTypes.STRING(20), allowNull: false, unique: true },
    type: { type: DataTypes.STRING(60), allowNull: false },
    base: { type: DataTypes.STRING(60), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...timestamps,
  })

  await queryInterface.createTable('specifications', {
    id,
    part_number: { type: DataTypes.STRING(60), allowNull: false },
    revision: { type: DataTypes.STRING(20), allowNull: false },
    status: { type: DataTypes.STRING(20), allowNull: false },
    supersedes_id: reference('specifications', true),
    title: { type: DataTypes.STRING(160), allowNull: false },
    accumulator_type: { type: DataTypes.STRING(20), allowNull: false },
    gas_volume: { type: DataTypes.FLOAT, allowNull: false },
    gas_volume_unit: { type: DataTypes.STRING(8), allowNull: false },
    pressure_unit: { type: DataTypes.STRING(8), allowNull: false },
    pressure_basis: { type: DataTypes.STRING(10), allowNull: false },
    reference_pressure: { type: DataTypes.FLOAT, allowNull: false },
    reference_temperature: { type: DataTypes.FLOAT, allowNull: false },
    reference_temperature_unit: { type: DataTypes.STRING(4), allowNull: false },
    tolerance_minus: { type: DataTypes.FLOAT, allowNull: false },
    tolerance_plus: { type: DataTypes.FLOAT, allowNull: false },
    tolerance_unit: { type: DataTypes.STRING(8), allowNull: false },
    correction_method: { type: DataTypes.STRING(20), allowNull: false },
    gas_model: { type: DataTypes.STRING(10), allowNull: false },
    max_pressure: { type: DataTypes.FLOAT, allowNull: false },
    min_pressure: { type: DataTypes.FLOAT, allowNull: false },
    settle_minutes: { type: DataTypes.INTEGER, allowNull: false },
    check_interval_days: { type: DataTypes.INTEGER, allowNull: true },
    loss_threshold_per_day: { type: DataTypes.FLOAT, allowNull: true },
    data_reference: { type: DataTypes.STRING(120), allowNull: false },
    data_revision: { type: DataTypes.STRING(40), allowNull: false },
    ...timestamps,
  })
  await queryInterface.addIndex('specifications', ['part_number', 'revision'], { unique: true })

  await queryInterface.createTable('specification_table_points', {
    id,
    specification_id: reference('specifications', false, 'CASCADE'),
    temperature: { type: DataTypes.FLOAT, allowNull: false },
    temperature_unit: { type: DataTypes.STRING(4), allowNull: false },
    pressure: { type: DataTypes.FLOAT, allowNull: false },
  })

  await queryInterface.createTable('accumulators', {
    id,
    part_number: { type: DataTypes.STRING(60), allowNull: false },
    serial_number: { type: DataTypes.STRING(60), allowNull: false },
    aircraft_id: reference('aircraft', true),
    position: { type: DataTypes.STRING(80), allowNull: true },
    system: { type: DataTypes.STRING(80), allowNull: true },
    installed_at: { type: DataTypes.DATEONLY, allowNull: true },
    ...timestamps,
  })
  await queryInterface.addIndex('accumulators', ['part_number', 'serial_number'], { unique: true })

  await queryInterface.createTable('accumulator_installations', {
    id,
    accumulator_id: reference('accumulators', false, 'CASCADE'),
    aircraft_id: reference('aircraft'),
    position: { type: DataTypes.STRING(80), allowNull: false },
    installed_at: { type: DataTypes.DATEONLY, allowNull: false },
    removed_at: { type: DataTypes.DATEONLY, allowNull: true },
    removal_reason: { type: DataTypes.STRING(200), allowNull: true },
  })

  await queryInterface.createTable('tools', {
    id,
    kind: { type: DataTypes.STRING(10), allowNull: false },
    asset_number: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    description: { type: DataTypes.STRING(160), allowNull: false },
    range_max: { type: DataTypes.FLOAT, allowNull: true },
    range_unit: { type: DataTypes.STRING(8), allowNull: true },
    resolution: { type: DataTypes.FLOAT, allowNull: true },
    accuracy: { type: DataTypes.FLOAT, allowNull: true },
    accuracy_unit: { type: DataTypes.STRING(8), allowNull: true },
    calibration_due: { type: DataTypes.DATEONLY, allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    ...timestamps,
  })

  await queryInterface.createTable('worksheets', {
    id,
    state: { type: DataTypes.STRING(24), allowNull: false },
    accumulator_id: reference('accumulators'),
    aircraft_id: reference('aircraft'),
    specification_id: reference('specifications'),
    performer_id: reference('users'),
    corrects_id: reference('worksheets', true),
    work_order: { type: DataTypes.STRING(60), allowNull: false },
    reason: { type: DataTypes.STRING(30), allowNull: false },
    content: { type: DataTypes.JSON, allowNull: false },
    results: { type: DataTypes.JSON, allowNull: false },
    engine_version: { type: DataTypes.STRING(20), allowNull: false },
    serviceable: { type: DataTypes.BOOLEAN, allowNull: true },
    return_reason: { type: DataTypes.TEXT, allowNull: true },
    void_reason: { type: DataTypes.TEXT, allowNull: true },
    voided_by_id: reference('users', true),
    performed_at: { type: DataTypes.DATE, allowNull: true },
    submitted_at: { type: DataTypes.DATE, allowNull: true },
    released_at: { type: DataTypes.DATE, allowNull: true },
    ...timestamps,
  })
  await queryInterface.addIndex('worksheets', ['state'])
  await queryInterface.addIndex('worksheets', ['accumulator_id'])

  await queryInterface.createTable('signatures', {
    id,
    worksheet_id: reference('worksheets'),
    user_id: reference('users'),
    capacity: { type: DataTypes.STRING(20), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    authorisation_number: { type: DataTypes.STRING(40), allowNull: true },
    statement: { type: DataTypes.TEXT, allowNull: false },
    signed_at: { type: DataTypes.DATE, allowNull: false },
  })

  await queryInterface.createTable('attachments', {
    id,
    worksheet_id: reference('worksheets', true),
    kind: { type: DataTypes.STRING(30), allowNull: false },
    original_name: { type: DataTypes.STRING(200), allowNull: false },
    mime_type: { type: DataTypes.STRING(60), allowNull: false },
    size_bytes: { type: DataTypes.INTEGER, allowNull: false },
    storage_key: { type: DataTypes.STRING(200), allowNull: false, unique: true },
    uploaded_by_id: reference('users'),
    created_at: { type: DataTypes.DATE, allowNull: false },
  })

  await queryInterface.createTable('audit_events', {
    id,
    at: { type: DataTypes.DATE, allowNull: false },
    actor_id: reference('users', true),
    entity: { type: DataTypes.STRING(40), allowNull: false },
    entity_id: { type: DataTypes.STRING(40), allowNull: false },
    action: { type: DataTypes.STRING(40), allowNull: false },
    detail: { type: DataTypes.JSON, allowNull: false },
    previous_hash: { type: DataTypes.STRING(64), allowNull: false },
    hash: { type: DataTypes.STRING(64), allowNull: false },
  })

  await queryInterface.createTable('sizing_studies', {
    id,
    name: { type: DataTypes.STRING(160), allowNull: false },
    specification_id: reference('specifications', true),
    inputs: { type: DataTypes.JSON, allowNull: false },
    results: { type: DataTypes.JSON, allowNull: false },
    engine_version: { type: DataTypes.STRING(20), allowNull: false },
    created_by_id: reference('users'),
    updated_by_id: reference('users'),
    ...timestamps,
  })

  await queryInterface.createTable('notifications', {
    id,
    recipient: { type: DataTypes.STRING(254), allowNull: false },
    subject: { type: DataTypes.STRING(200), allowNull: false },
    body: { type: DataTypes.TEXT, allowNull: false },
    kind: { type: DataTypes.STRING(40), allowNull: false },
    worksheet_id: reference('worksheets', true),
    status: { type: DataTypes.STRING(10), allowNull: false },
    error: { type: DataTypes.TEXT, allowNull: true },
    message_id: { type: DataTypes.STRING(200), allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
  })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  for (const table of [
    'notifications', 'sizing_studies', 'audit_events', 'attachments', 'signatures', 'worksheets', 'tools',
    'accumulator_installations', 'accumulators', 'specification_table_points', 'specifications', 'aircraft',
    'login_attempts', 'users',
  ]) await queryInterface.dropTable(table)
}
