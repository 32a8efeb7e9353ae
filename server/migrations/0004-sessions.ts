import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Server-side sessions: the sealed cookie names a row here, and a user's session version
 * (bumped by a password change or reset, disabling, a role change, or "sign out everywhere")
 * must match it, so a cookie stops working the moment its reason to work does.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.addColumn('users', 'session_version', { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 })
  await queryInterface.createTable('user_sessions', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true, allowNull: false },
    token: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    session_version: { type: DataTypes.INTEGER, allowNull: false },
    user_agent: { type: DataTypes.STRING(300), allowNull: true },
    address: { type: DataTypes.STRING(64), allowNull: true },
    created_at: { type: DataTypes.DATE, allowNull: false },
    last_seen_at: { type: DataTypes.DATE, allowNull: false },
    ended_at: { type: DataTypes.DATE, allowNull: true },
    end_reason: { type: DataTypes.STRING(40), allowNull: true },
  })
  await queryInterface.addIndex('user_sessions', ['user_id', 'ended_at'])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.dropTable('user_sessions')
  await queryInterface.removeColumn('users', 'session_version')
}
