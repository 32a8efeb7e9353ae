import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * The id of the request that wrote each audit entry (the `x-request-id` it came with, or one given to it), to
 * find the entry's request in the server's logs. Not part of the entry's hash: it says where to look, not what
 * happened.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.addColumn('audit_events', 'request_id', { type: DataTypes.STRING(64), allowNull: true })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeColumn('audit_events', 'request_id')
}
