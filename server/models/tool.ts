import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { PressureUnit } from '../../shared/gas/types'
import type { ToolKind } from '../../shared/types/registers'

/** A pressure gauge (range, resolution, accuracy, calibration) or a nitrogen cart. */
export class Tool extends Model<InferAttributes<Tool>, InferCreationAttributes<Tool>> {
  declare id: CreationOptional<number>
  declare kind: ToolKind
  declare assetNumber: string
  declare description: string
  declare rangeMax: number | null
  declare rangeUnit: PressureUnit | null
  declare resolution: number | null
  declare accuracy: number | null
  /** A pressure unit, or '%FS' (per cent of full scale). */
  declare accuracyUnit: PressureUnit | '%FS' | null
  declare calibrationDue: string | null
  declare active: CreationOptional<boolean>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    Tool.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      kind: { type: DataTypes.STRING(10), allowNull: false },
      assetNumber: { type: DataTypes.STRING(40), allowNull: false, unique: true },
      description: { type: DataTypes.STRING(160), allowNull: false },
      rangeMax: { type: DataTypes.FLOAT, allowNull: true },
      rangeUnit: { type: DataTypes.STRING(8), allowNull: true },
      resolution: { type: DataTypes.FLOAT, allowNull: true },
      accuracy: { type: DataTypes.FLOAT, allowNull: true },
      accuracyUnit: { type: DataTypes.STRING(8), allowNull: true },
      calibrationDue: { type: DataTypes.DATEONLY, allowNull: true },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'tools', underscored: true })
  }
}
