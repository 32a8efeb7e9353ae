import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize'
import type { PrechargeReading as EngineReading } from '../../shared/gas/leakage'

/**
 * One pre-charge reading of a released worksheet (its as-found, and its as-left after a charge
 * or vent), stored when the worksheet is released, with the value carried to the reference
 * temperature of the specification it was normalised against.
 */
export class PrechargeReading extends Model<
  InferAttributes<PrechargeReading>,
  InferCreationAttributes<PrechargeReading>
> {
  declare id: CreationOptional<number>
  declare accumulatorId: ForeignKey<number>
  declare worksheetId: ForeignKey<number>
  declare kind: 'as-found' | 'as-left'
  declare action: 'none' | 'charge' | 'vent'
  declare takenAt: Date
  /** The reading as taken: pressure, gas temperature, atmosphere. */
  declare reading: Pick<EngineReading, 'pressure' | 'temperature' | 'ambient'>
  declare startsSegment: boolean
  declare specificationId: ForeignKey<number> | null
  declare normalised: number | null

  static initModel(sequelize: Sequelize): void {
    PrechargeReading.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        accumulatorId: { type: DataTypes.INTEGER, allowNull: false },
        worksheetId: { type: DataTypes.INTEGER, allowNull: false },
        kind: { type: DataTypes.STRING(10), allowNull: false },
        action: { type: DataTypes.STRING(10), allowNull: false },
        takenAt: { type: DataTypes.DATE, allowNull: false },
        reading: { type: DataTypes.JSON, allowNull: false },
        startsSegment: { type: DataTypes.BOOLEAN, allowNull: false },
        specificationId: { type: DataTypes.INTEGER, allowNull: true },
        normalised: { type: DataTypes.FLOAT, allowNull: true },
      },
      { sequelize, tableName: 'precharge_readings', underscored: true, timestamps: false },
    )
  }
}
