import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Certifying authorisations as a register (`authorisations`: holder, number, privileges, scope, issue
 * and expiry dates, issuing body, suspension with its reason), and on each signature the authorisation
 * it was made under, frozen (`signatures.authorisation`; empty on signatures made before the register).
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.createTable('authorisations', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    holder_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } },
    number: { type: DataTypes.STRING(40), allowNull: false, unique: true },
    privileges: { type: DataTypes.STRING(10), allowNull: false },
    scope_kind: { type: DataTypes.STRING(20), allowNull: false },
    scope: { type: DataTypes.JSON, allowNull: false },
    issued_on: { type: DataTypes.STRING(10), allowNull: false },
    expires_on: { type: DataTypes.STRING(10), allowNull: false },
    issuing_body: { type: DataTypes.STRING(120), allowNull: false },
    suspended_at: { type: DataTypes.DATE, allowNull: true },
    suspended_reason: { type: DataTypes.TEXT, allowNull: true },
    expiry_notice_sent_at: { type: DataTypes.DATE, allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.addIndex('authorisations', ['holder_id'])
  await queryInterface.addIndex('authorisations', ['expires_on'])
  await queryInterface.addColumn('signatures', 'authorisation', { type: DataTypes.JSON, allowNull: true })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeColumn('signatures', 'authorisation')
  await queryInterface.dropTable('authorisations')
}
