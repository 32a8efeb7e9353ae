import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize'
import type { TemperatureUnit } from '../../shared/gas/types'

/** One temperature/pressure point of an approved-data table (pressure in the specification's unit and basis). */
export class SpecificationTablePoint extends Model<
  InferAttributes<SpecificationTablePoint>,
  InferCreationAttributes<SpecificationTablePoint>
> {
  declare id: CreationOptional<number>
  declare specificationId: ForeignKey<number>
  declare temperature: number
  declare temperatureUnit: TemperatureUnit
  declare pressure: number

  static initModel(sequelize: Sequelize): void {
    SpecificationTablePoint.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        specificationId: { type: DataTypes.INTEGER, allowNull: false },
        temperature: { type: DataTypes.FLOAT, allowNull: false },
        temperatureUnit: { type: DataTypes.STRING(4), allowNull: false },
        pressure: { type: DataTypes.FLOAT, allowNull: false },
      },
      { sequelize, tableName: 'specification_table_points', underscored: true, timestamps: false },
    )
  }
}
