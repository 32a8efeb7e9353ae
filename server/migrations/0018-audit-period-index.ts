import type { QueryInterface } from 'sequelize'

/**
 * The audit trail by time: a period's signed export (and the records archive's) finds the first and last
 * entry of its period through this index instead of reading the whole chain.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.addIndex('audit_events', ['at', 'id'], { name: 'audit_events_at' })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeIndex('audit_events', 'audit_events_at')
}
