import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Signed webhooks from a durable outbox: endpoints an administrator registers per event, one delivery row
 * per event and endpoint (written in the write that caused the event), and each attempt's outcome.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.createTable('webhook_endpoints', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    url: { type: DataTypes.STRING(500), allowNull: false },
    description: { type: DataTypes.STRING(200), allowNull: false },
    events: { type: DataTypes.JSON, allowNull: false },
    secret: { type: DataTypes.STRING(100), allowNull: false },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    created_by_id: { type: DataTypes.INTEGER, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.createTable('webhook_deliveries', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    endpoint_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'webhook_endpoints', key: 'id' } },
    event_type: { type: DataTypes.STRING(40), allowNull: false },
    message_id: { type: DataTypes.STRING(100), allowNull: false },
    subject: { type: DataTypes.STRING(80), allowNull: false },
    payload: { type: DataTypes.TEXT, allowNull: false },
    status: { type: DataTypes.STRING(10), allowNull: false },
    attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    next_attempt_at: { type: DataTypes.DATE, allowNull: true },
    last_attempt_at: { type: DataTypes.DATE, allowNull: true },
    delivered_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
  })
  // One delivery of a message to an endpoint: an event announced twice (a gauge found due on every check) is kept once.
  await queryInterface.addIndex('webhook_deliveries', ['endpoint_id', 'message_id'], { unique: true })
  await queryInterface.addIndex('webhook_deliveries', ['status', 'next_attempt_at'])
  await queryInterface.addIndex('webhook_deliveries', ['endpoint_id', 'subject', 'id'])
  await queryInterface.createTable('webhook_attempts', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    delivery_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'webhook_deliveries', key: 'id' } },
    attempted_at: { type: DataTypes.DATE, allowNull: false },
    status_code: { type: DataTypes.INTEGER, allowNull: true },
    error: { type: DataTypes.TEXT, allowNull: true },
    duration_ms: { type: DataTypes.INTEGER, allowNull: false },
  })
  await queryInterface.addIndex('webhook_attempts', ['delivery_id'])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.dropTable('webhook_attempts')
  await queryInterface.dropTable('webhook_deliveries')
  await queryInterface.dropTable('webhook_endpoints')
}
