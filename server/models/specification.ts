import {
  DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes,
  type NonAttribute, type Sequelize,
} from 'sequelize'
import type { AccumulatorType, CorrectionMethod, SpecificationStatus } from '../../shared/types/registers'
import type { GasModel, PressureBasis, PressureUnit, TemperatureUnit, VolumeUnit } from '../../shared/gas/types'
import type { SpecificationTablePoint } from './specification-table-point'

/**
 * A servicing specification for one part number at one revision of the approved data.
 * Pressures are all in `pressureUnit` and `pressureBasis`; a new revision supersedes the old
 * one and worksheets keep the revision they used.
 */
export class Specification extends Model<InferAttributes<Specification>, InferCreationAttributes<Specification>> {
  declare id: CreationOptional<number>
  declare partNumber: string
  declare revision: string
  declare status: SpecificationStatus
  declare supersedesId: ForeignKey<number> | null
  declare title: string
  declare accumulatorType: AccumulatorType
  declare gasVolume: number
  declare gasVolumeUnit: VolumeUnit
  declare pressureUnit: PressureUnit
  declare pressureBasis: PressureBasis
  declare referencePressure: number
  declare referenceTemperature: number
  declare referenceTemperatureUnit: TemperatureUnit
  declare toleranceMinus: number
  declare tolerancePlus: number
  declare toleranceUnit: PressureUnit | '%'
  declare correctionMethod: CorrectionMethod
  declare gasModel: GasModel
  declare maxPressure: number
  declare minPressure: number
  declare settleMinutes: number
  declare checkIntervalDays: number | null
  declare lossThresholdPerDay: number | null
  declare dataReference: string
  declare dataRevision: string
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare tablePoints?: NonAttribute<SpecificationTablePoint[]>

  static initModel(sequelize: Sequelize): void {
    Specification.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      partNumber: { type: DataTypes.STRING(60), allowNull: false },
      revision: { type: DataTypes.STRING(20), allowNull: false },
      status: { type: DataTypes.STRING(20), allowNull: false },
      supersedesId: { type: DataTypes.INTEGER, allowNull: true },
      title: { type: DataTypes.STRING(160), allowNull: false },
      accumulatorType: { type: DataTypes.STRING(20), allowNull: false },
      gasVolume: { type: DataTypes.FLOAT, allowNull: false },
      gasVolumeUnit: { type: DataTypes.STRING(8), allowNull: false },
      pressureUnit: { type: DataTypes.STRING(8), allowNull: false },
      pressureBasis: { type: DataTypes.STRING(10), allowNull: false },
      referencePressure: { type: DataTypes.FLOAT, allowNull: false },
      referenceTemperature: { type: DataTypes.FLOAT, allowNull: false },
      referenceTemperatureUnit: { type: DataTypes.STRING(4), allowNull: false },
      toleranceMinus: { type: DataTypes.FLOAT, allowNull: false },
      tolerancePlus: { type: DataTypes.FLOAT, allowNull: false },
      toleranceUnit: { type: DataTypes.STRING(8), allowNull: false },
      correctionMethod: { type: DataTypes.STRING(20), allowNull: false },
      gasModel: { type: DataTypes.STRING(10), allowNull: false },
      maxPressure: { type: DataTypes.FLOAT, allowNull: false },
      minPressure: { type: DataTypes.FLOAT, allowNull: false },
      settleMinutes: { type: DataTypes.INTEGER, allowNull: false },
      checkIntervalDays: { type: DataTypes.INTEGER, allowNull: true },
      lossThresholdPerDay: { type: DataTypes.FLOAT, allowNull: true },
      dataReference: { type: DataTypes.STRING(120), allowNull: false },
      dataRevision: { type: DataTypes.STRING(40), allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'specifications', underscored: true })
  }
}
