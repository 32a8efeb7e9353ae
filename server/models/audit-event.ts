import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** An append-only, hash-chained audit entry: `hash` covers this entry and `previousHash`. */
export class AuditEvent extends Model<InferAttributes<AuditEvent>, InferCreationAttributes<AuditEvent>> {
  declare id: CreationOptional<number>
  declare at: Date
  declare actorId: ForeignKey<number> | null
  declare entity: string
  declare entityId: string
  declare action: string
  declare detail: Record<string, unknown>
  declare previousHash: string
  declare hash: string

  static initModel(sequelize: Sequelize): void {
    AuditEvent.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      at: { type: DataTypes.DATE, allowNull: false },
      actorId: { type: DataTypes.INTEGER, allowNull: true },
      entity: { type: DataTypes.STRING(40), allowNull: false },
      entityId: { type: DataTypes.STRING(40), allowNull: false },
      action: { type: DataTypes.STRING(40), allowNull: false },
      detail: { type: DataTypes.JSON, allowNull: false },
      previousHash: { type: DataTypes.STRING(64), allowNull: false },
      hash: { type: DataTypes.STRING(64), allowNull: false },
    }, {
      sequelize, tableName: 'audit_events', underscored: true, timestamps: false,
      hooks: {
        beforeUpdate: () => { throw new Error('Audit events are append-only.') },
        beforeDestroy: () => { throw new Error('Audit events are append-only.') },
      },
    })
  }
}
