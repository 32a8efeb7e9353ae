import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

export class LoginAttempt extends Model<InferAttributes<LoginAttempt>, InferCreationAttributes<LoginAttempt>> {
  declare id: CreationOptional<number>
  declare email: string
  declare succeeded: boolean
  declare at: Date

  static initModel(sequelize: Sequelize): void {
    LoginAttempt.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
      at: { type: DataTypes.DATE, allowNull: false },
    }, { sequelize, tableName: 'login_attempts', underscored: true, timestamps: false })
  }
}
