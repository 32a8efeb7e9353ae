import type { CycleCheckBody } from '../../shared/schemas/cycle-check'
import type { CycleCheckResults } from '../../shared/types/trends'
import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize'

/**
 * A pump cycle check: cut-out and cut-in pressures and the interval between them, with the leak rate the engine
 * found.
 */
export class CycleCheck extends Model<InferAttributes<CycleCheck>, InferCreationAttributes<CycleCheck>> {
  declare id: CreationOptional<number>
  declare aircraftId: ForeignKey<number>
  declare accumulatorId: ForeignKey<number>
  declare system: string
  declare checkedAt: Date
  declare inputs: CycleCheckBody
  declare results: CycleCheckResults
  declare intervalSeconds: number
  declare engineVersion: string
  declare recordedById: ForeignKey<number>
  /** Row version: a correction names the version it read (compare-and-set). */
  declare version: CreationOptional<number>
  /** Withdrawn checks are kept, with why and by whom, and left out of the trend. */
  declare withdrawnAt: CreationOptional<Date | null>
  declare withdrawnReason: CreationOptional<string | null>
  declare withdrawnById: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date | null>

  static initModel(sequelize: Sequelize): void {
    CycleCheck.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        aircraftId: { type: DataTypes.INTEGER, allowNull: false },
        accumulatorId: { type: DataTypes.INTEGER, allowNull: false },
        system: { type: DataTypes.STRING(80), allowNull: false },
        checkedAt: { type: DataTypes.DATE, allowNull: false },
        inputs: { type: DataTypes.JSON, allowNull: false },
        results: { type: DataTypes.JSON, allowNull: false },
        intervalSeconds: { type: DataTypes.FLOAT, allowNull: false },
        engineVersion: { type: DataTypes.STRING(20), allowNull: false },
        recordedById: { type: DataTypes.INTEGER, allowNull: false },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        withdrawnAt: { type: DataTypes.DATE, allowNull: true },
        withdrawnReason: { type: DataTypes.TEXT, allowNull: true },
        withdrawnById: { type: DataTypes.INTEGER, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'cycle_checks', underscored: true },
    )
  }
}
