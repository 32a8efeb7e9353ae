import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** A trend flag that has been raised (and mailed); cleared when the trend no longer flags. */
export class TrendAlert extends Model<InferAttributes<TrendAlert>, InferCreationAttributes<TrendAlert>> {
  declare id: CreationOptional<number>
  declare kind: 'precharge' | 'cycle' | 'integrity'
  declare subject: string
  declare message: string
  declare raisedAt: Date
  declare clearedAt: Date | null

  static initModel(sequelize: Sequelize): void {
    TrendAlert.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      kind: { type: DataTypes.STRING(20), allowNull: false },
      subject: { type: DataTypes.STRING(120), allowNull: false },
      message: { type: DataTypes.TEXT, allowNull: false },
      raisedAt: { type: DataTypes.DATE, allowNull: false },
      clearedAt: { type: DataTypes.DATE, allowNull: true },
    }, { sequelize, tableName: 'trend_alerts', underscored: true, timestamps: false })
  }
}
