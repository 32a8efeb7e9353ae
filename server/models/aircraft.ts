import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

export class Aircraft extends Model<InferAttributes<Aircraft>, InferCreationAttributes<Aircraft>> {
  declare id: CreationOptional<number>
  declare registration: string
  declare fleetNumber: string
  declare type: string
  /** The name of the station the aircraft is based at. */
  declare base: string
  /** Its operator; empty on aircraft written before operators, which are the organisation's own fleet. */
  declare operatorId: number | null
  declare active: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    Aircraft.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      registration: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      fleetNumber: { type: DataTypes.STRING(20), allowNull: false, unique: true },
      type: { type: DataTypes.STRING(60), allowNull: false },
      base: { type: DataTypes.STRING(60), allowNull: false },
      operatorId: { type: DataTypes.INTEGER, allowNull: true },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'aircraft', underscored: true })
  }
}
