import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * API tokens: for another system to call the API as a user, with scopes, an expiry and revocation. Only the
 * SHA-256 of a token is kept (`token_hash`); its first characters (`prefix`) name it in lists.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.createTable('api_tokens', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } },
    name: { type: DataTypes.STRING(80), allowNull: false },
    prefix: { type: DataTypes.STRING(16), allowNull: false },
    token_hash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
    scopes: { type: DataTypes.JSON, allowNull: false },
    expires_at: { type: DataTypes.DATE, allowNull: false },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    last_used_at: { type: DataTypes.DATE, allowNull: true },
    created_by_id: { type: DataTypes.INTEGER, allowNull: false },
    created_at: { type: DataTypes.DATE, allowNull: false },
  })
  await queryInterface.addIndex('api_tokens', ['user_id'])
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.dropTable('api_tokens')
}
