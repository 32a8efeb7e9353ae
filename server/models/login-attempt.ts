import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

export class LoginAttempt extends Model<InferAttributes<LoginAttempt>, InferCreationAttributes<LoginAttempt>> {
  declare id: CreationOptional<number>
  declare email: string
  declare succeeded: boolean
  declare at: Date
  /** The client address the attempt came from (for the per-address limit). */
  declare address: string | null

  static initModel(sequelize: Sequelize): void {
    LoginAttempt.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.STRING(254), allowNull: false },
      succeeded: { type: DataTypes.BOOLEAN, allowNull: false },
      at: { type: DataTypes.DATE, allowNull: false },
      address: { type: DataTypes.STRING(64), allowNull: true },
    }, { sequelize, tableName: 'login_attempts', underscored: true, timestamps: false })
  }
}
