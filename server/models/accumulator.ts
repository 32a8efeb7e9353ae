import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { Aircraft } from './aircraft'

/** A serialised accumulator; while installed it carries its aircraft and position. */
export class Accumulator extends Model<InferAttributes<Accumulator>, InferCreationAttributes<Accumulator>> {
  declare id: CreationOptional<number>
  declare partNumber: string
  declare serialNumber: string
  declare aircraftId: ForeignKey<number> | null
  declare position: string | null
  declare system: string | null
  declare installedAt: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare aircraft?: NonAttribute<Aircraft>

  static initModel(sequelize: Sequelize): void {
    Accumulator.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      partNumber: { type: DataTypes.STRING(60), allowNull: false },
      serialNumber: { type: DataTypes.STRING(60), allowNull: false },
      aircraftId: { type: DataTypes.INTEGER, allowNull: true },
      position: { type: DataTypes.STRING(80), allowNull: true },
      system: { type: DataTypes.STRING(80), allowNull: true },
      installedAt: { type: DataTypes.DATEONLY, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'accumulators', underscored: true })
  }
}
