import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

export type NotificationStatus = 'queued' | 'sending' | 'sent' | 'failed'

/** An e-mail Chargewell sends: queued with the write that caused it, sent in the background, kept for the Outbox. */
export class Notification extends Model<InferAttributes<Notification>, InferCreationAttributes<Notification>> {
  declare id: CreationOptional<number>
  declare recipient: string
  declare subject: string
  declare body: string
  declare kind: string
  declare worksheetId: ForeignKey<number> | null
  /** queued (waiting for its next try), sending, sent, or failed (given up after every retry). */
  declare status: NotificationStatus
  declare attempts: CreationOptional<number>
  declare nextAttemptAt: Date | null
  declare lastAttemptAt: Date | null
  declare error: string | null
  declare messageId: string | null
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    Notification.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      recipient: { type: DataTypes.STRING(254), allowNull: false },
      subject: { type: DataTypes.STRING(200), allowNull: false },
      body: { type: DataTypes.TEXT, allowNull: false },
      kind: { type: DataTypes.STRING(40), allowNull: false },
      worksheetId: { type: DataTypes.INTEGER, allowNull: true },
      status: { type: DataTypes.STRING(10), allowNull: false },
      error: { type: DataTypes.TEXT, allowNull: true },
      messageId: { type: DataTypes.STRING(200), allowNull: true },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
      lastAttemptAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'notifications', underscored: true, updatedAt: false })
  }
}
