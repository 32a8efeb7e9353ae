import { DataTypes, type QueryInterface } from 'sequelize'

/**
 * Signatures that verify without trusting the server.
 * - `passkeys`: each user's signing credentials (WebAuthn public keys) with registration and
 *   revocation times; never deleted, so a key revoked later still verifies what it signed.
 * - `signatures`: how each was made (`method`: password or passkey; empty on rows written before,
 *   which were all password signatures), the passkey, the WebAuthn assertion (authenticator data,
 *   client data, signature), and what was signed: the digest of each field of the record's
 *   canonical content (`signed_fields`) and the payload whose SHA-256 was the challenge.
 * - `settings`: organisation settings, first of them how each role signs.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.createTable('passkeys', {
    id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
    user_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' } },
    credential_id: { type: DataTypes.STRING(400), allowNull: false, unique: true },
    public_key: { type: DataTypes.TEXT, allowNull: false },
    counter: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
    transports: { type: DataTypes.JSON, allowNull: false },
    name: { type: DataTypes.STRING(80), allowNull: false },
    registered_at: { type: DataTypes.DATE, allowNull: false },
    revoked_at: { type: DataTypes.DATE, allowNull: true },
    last_used_at: { type: DataTypes.DATE, allowNull: true },
  })
  await queryInterface.addIndex('passkeys', ['user_id'])
  await queryInterface.addColumn('signatures', 'method', { type: DataTypes.STRING(20), allowNull: true })
  await queryInterface.addColumn('signatures', 'passkey_id', { type: DataTypes.INTEGER, allowNull: true, references: { model: 'passkeys', key: 'id' } })
  await queryInterface.addColumn('signatures', 'payload', { type: DataTypes.JSON, allowNull: true })
  await queryInterface.addColumn('signatures', 'signed_fields', { type: DataTypes.JSON, allowNull: true })
  await queryInterface.addColumn('signatures', 'assertion', { type: DataTypes.JSON, allowNull: true })
  await queryInterface.createTable('settings', {
    key: { type: DataTypes.STRING(60), primaryKey: true },
    value: { type: DataTypes.JSON, allowNull: false },
    updated_at: { type: DataTypes.DATE, allowNull: false },
    updated_by_id: { type: DataTypes.INTEGER, allowNull: true, references: { model: 'users', key: 'id' } },
  })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.dropTable('settings')
  for (const column of ['assertion', 'signed_fields', 'payload', 'passkey_id', 'method']) await queryInterface.removeColumn('signatures', column)
  await queryInterface.dropTable('passkeys')
}
