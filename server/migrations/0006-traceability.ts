import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Tools traced to the work done with them, cycle checks that can be corrected or withdrawn, and
 * worksheets started on a device without a connection.
 * - `worksheets.gauge_id` / `cart_id`: the tools frozen in the worksheet's content, on the row
 *   (like the list's other columns) so a tool's page lists the work it was used for at once —
 *   what a quality department asks first when a gauge is found out of calibration.
 * - `worksheets.client_id`: the id a device gave a worksheet it started offline; unique, so a
 *   sync sent twice creates it once.
 * - `cycle_checks`: a row version (corrections are compare-and-set) and a withdrawal with its
 *   reason and who withdrew it (kept, never deleted, out of the trend).
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  const postgres = sequelize.getDialect() === 'postgres'
  await queryInterface.addColumn('worksheets', 'gauge_id', { type: DataTypes.INTEGER, allowNull: true })
  await queryInterface.addColumn('worksheets', 'cart_id', { type: DataTypes.INTEGER, allowNull: true })
  await queryInterface.addColumn('worksheets', 'client_id', { type: DataTypes.STRING(36), allowNull: true })
  const json = (path: string) => postgres ? `(content::json #>> '{${path.split('.').join(',')}}')::integer` : `json_extract(content, '$.${path}')`
  await sequelize.query(`UPDATE worksheets SET gauge_id = ${json('tools.gauge.id')}, cart_id = ${json('tools.cart.id')}`)
  await queryInterface.addIndex('worksheets', ['gauge_id', 'performed_at'])
  await queryInterface.addIndex('worksheets', ['cart_id', 'performed_at'])
  await queryInterface.addIndex('worksheets', ['client_id'], { unique: true, name: 'worksheets_client_id_unique' })

  await queryInterface.addColumn('cycle_checks', 'version', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 })
  await queryInterface.addColumn('cycle_checks', 'updated_at', { type: DataTypes.DATE, allowNull: true })
  await queryInterface.addColumn('cycle_checks', 'withdrawn_at', { type: DataTypes.DATE, allowNull: true })
  await queryInterface.addColumn('cycle_checks', 'withdrawn_reason', { type: DataTypes.TEXT, allowNull: true })
  await queryInterface.addColumn('cycle_checks', 'withdrawn_by_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } })
  await queryInterface.addIndex('cycle_checks', ['withdrawn_by_id'])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  for (const column of ['withdrawn_by_id', 'withdrawn_reason', 'withdrawn_at', 'updated_at', 'version']) await queryInterface.removeColumn('cycle_checks', column)
  await queryInterface.removeIndex('worksheets', 'worksheets_client_id_unique')
  for (const column of ['client_id', 'cart_id', 'gauge_id']) await queryInterface.removeColumn('worksheets', column)
}
