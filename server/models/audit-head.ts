import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/**
 * The head of the audit chain, one row, updated in the same transaction as every appended
 * entry: how many entries there are, the last one, and an HMAC seal over them with the
 * server's audit secret, so deleting the newest entries or rebuilding the chain is caught.
 */
export class AuditHead extends Model<InferAttributes<AuditHead>, InferCreationAttributes<AuditHead>> {
  declare id: number
  declare eventCount: number
  declare lastEventId: number | null
  declare lastHash: string
  declare seal: string | null
  declare sealedAt: Date | null

  static initModel(sequelize: Sequelize): void {
    AuditHead.init({
      id: { type: DataTypes.INTEGER, primaryKey: true },
      eventCount: { type: DataTypes.INTEGER, allowNull: false },
      lastEventId: { type: DataTypes.INTEGER, allowNull: true },
      lastHash: { type: DataTypes.STRING(64), allowNull: false },
      seal: { type: DataTypes.STRING(64), allowNull: true },
      sealedAt: { type: DataTypes.DATE, allowNull: true },
    }, { sequelize, tableName: 'audit_heads', underscored: true, timestamps: false })
  }
}
