import { DataTypes, Model, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** An organisation setting an administrator chooses (e.g. how each role signs); every change is audited. */
export class Setting extends Model<InferAttributes<Setting>, InferCreationAttributes<Setting>> {
  declare key: string
  declare value: unknown
  declare updatedAt: Date
  declare updatedById: number | null

  static initModel(sequelize: Sequelize): void {
    Setting.init({
      key: { type: DataTypes.STRING(60), primaryKey: true },
      value: { type: DataTypes.JSON, allowNull: false },
      updatedAt: { type: DataTypes.DATE, allowNull: false },
      updatedById: { type: DataTypes.INTEGER, allowNull: true },
    }, { sequelize, tableName: 'settings', underscored: true, timestamps: false })
  }
}
