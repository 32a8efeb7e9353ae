import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/**
 * A station: where aircraft are based and worked on. Its time zone dates the records of its aircraft; its
 * field elevation is the calculators' default there. Its name is what an aircraft's base holds, so it is
 * never renamed (a new station is added instead).
 */
export class Station extends Model<InferAttributes<Station>, InferCreationAttributes<Station>> {
  declare id: CreationOptional<number>
  declare name: string
  declare code: string
  declare timeZone: string
  declare elevationValue: number
  declare elevationUnit: 'ft' | 'm'
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    Station.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: DataTypes.STRING(60), allowNull: false, unique: true },
      code: { type: DataTypes.STRING(8), allowNull: false, unique: true },
      timeZone: { type: DataTypes.STRING(60), allowNull: false },
      elevationValue: { type: DataTypes.DOUBLE, allowNull: false },
      elevationUnit: { type: DataTypes.STRING(2), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'stations', underscored: true })
  }
}
