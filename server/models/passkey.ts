import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/**
 * A signing credential a user registered (WebAuthn): the authenticator keeps the private key, the
 * register keeps the public key with when it was registered and, once revoked, when. A revoked key
 * still verifies what it signed before its revocation; it never signs again. Never deleted.
 */
export class Passkey extends Model<InferAttributes<Passkey>, InferCreationAttributes<Passkey>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<number>
  /** The credential id, base64url, as the authenticator gave it. */
  declare credentialId: string
  /** The COSE public key, base64url. */
  declare publicKey: string
  declare counter: number
  /** usb, nfc, ble, hybrid, internal: how the browser reaches it. */
  declare transports: string[]
  /** The user's own name for it: "Tablet 3 in hangar B", "My key". */
  declare name: string
  declare registeredAt: Date
  declare revokedAt: Date | null
  declare lastUsedAt: Date | null

  static initModel(sequelize: Sequelize): void {
    Passkey.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      credentialId: { type: DataTypes.STRING(400), allowNull: false, unique: true },
      publicKey: { type: DataTypes.TEXT, allowNull: false },
      counter: { type: DataTypes.BIGINT, allowNull: false, defaultValue: 0 },
      transports: { type: DataTypes.JSON, allowNull: false, defaultValue: [] },
      name: { type: DataTypes.STRING(80), allowNull: false },
      registeredAt: { type: DataTypes.DATE, allowNull: false },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
    }, { sequelize, tableName: 'passkeys', underscored: true, timestamps: false })
  }
}
