import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** An e-mail Chargewell sent (or failed to send), kept for the Outbox. */
export class Notification extends Model<InferAttributes<Notification>, InferCreationAttributes<Notification>> {
  declare id: CreationOptional<number>
  declare recipient: string
  declare subject: string
  declare body: string
  declare kind: string
  declare worksheetId: ForeignKey<number> | null
  declare status: 'sent' | 'failed'
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
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'notifications', underscored: true, updatedAt: false })
  }
}
