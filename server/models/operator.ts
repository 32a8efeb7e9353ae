import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/**
 * An operator: the owner of aircraft the organisation maintains. One is the organisation's own fleet
 * (`own`); aircraft written before operators existed belong to it.
 */
export class Operator extends Model<InferAttributes<Operator>, InferCreationAttributes<Operator>> {
  declare id: CreationOptional<number>
  declare name: string
  declare code: string
  declare own: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    Operator.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: DataTypes.STRING(120), allowNull: false, unique: true },
      code: { type: DataTypes.STRING(8), allowNull: false, unique: true },
      own: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'operators', underscored: true })
  }
}
