import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Single sign-on: the subject (`sub`) the organisation's identity provider gives a user, linked at their first
 * sign-in through it (matched by e-mail) and the key of every one after. Empty for users who never used it.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.addColumn('users', 'oidc_subject', { type: DataTypes.STRING(255), allowNull: true })
  await queryInterface.addIndex('users', ['oidc_subject'], { unique: true })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeIndex('users', ['oidc_subject'])
  await queryInterface.removeColumn('users', 'oidc_subject')
}
