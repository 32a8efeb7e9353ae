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
  /** SHA-256 of the canonical content of the record the entry concerns, as it stood after the change. */
  declare recordHash: string | null
  /** 1: the first chain (entry fields only); 2: the record hash is part of the entry's hash. */
  declare hashVersion: CreationOptional<number>
  /** The request that wrote it (its x-request-id), to find it in the logs; not hashed. */
  declare requestId: CreationOptional<string | null>

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
      recordHash: { type: DataTypes.STRING(64), allowNull: true },
      hashVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 2 },
      requestId: { type: DataTypes.STRING(64), allowNull: true },
    }, {
      sequelize, tableName: 'audit_events', underscored: true, timestamps: false,
      hooks: {
        beforeUpdate: () => { throw new Error('Audit events are append-only.') },
        beforeDestroy: () => { throw new Error('Audit events are append-only.') },
      },
    })
  }
}
