import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Mail from a durable outbox: a notification is written as `queued` with the write that caused it
 * and sent in the background, retried with backoff; the outbox shows the attempts and the next try.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.addColumn('notifications', 'attempts', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 })
  await queryInterface.addColumn('notifications', 'next_attempt_at', { type: DataTypes.DATE, allowNull: true })
  await queryInterface.addColumn('notifications', 'last_attempt_at', { type: DataTypes.DATE, allowNull: true })
  await queryInterface.changeColumn('notifications', 'status', { type: DataTypes.STRING(10), allowNull: false })
  await queryInterface.addIndex('notifications', ['status', 'next_attempt_at'])
  // One row the health route rewrites (at most every few seconds) to find out whether the database takes writes.
  await queryInterface.createTable('health_probes', {
    id: { type: DataTypes.INTEGER, primaryKey: true },
    probed_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.bulkInsert('health_probes', [{ id: 1, probed_at: new Date() }])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.dropTable('health_probes')
  await queryInterface.removeIndex('notifications', ['status', 'next_attempt_at'])
  for (const column of ['last_attempt_at', 'next_attempt_at', 'attempts']) await queryInterface.removeColumn('notifications', column)
}
