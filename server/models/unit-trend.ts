import { DataTypes, Model, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { PrechargeFit } from '../../shared/gas/leakage'
import type { UnitTrendFlag } from '../../shared/utils/trend-flags'

/** A unit's pre-charge trend as last computed (after a release, a void or a revision touching it). */
export class UnitTrend extends Model<InferAttributes<UnitTrend>, InferCreationAttributes<UnitTrend>> {
  declare accumulatorId: ForeignKey<number>
  declare specificationId: ForeignKey<number> | null
  /** The fit without its points (those are the unit's precharge_readings). */
  declare fit: Omit<PrechargeFit, 'normalised'> | null
  declare flag: UnitTrendFlag
  declare lossPerDay: number | null
  declare flagged: boolean
  declare services: number
  declare lastServiceAt: Date | null
  declare computedAt: Date

  static initModel(sequelize: Sequelize): void {
    UnitTrend.init({
      accumulatorId: { type: DataTypes.INTEGER, primaryKey: true },
      specificationId: { type: DataTypes.INTEGER, allowNull: true },
      fit: { type: DataTypes.JSON, allowNull: true },
      flag: { type: DataTypes.JSON, allowNull: false },
      lossPerDay: { type: DataTypes.FLOAT, allowNull: true },
      flagged: { type: DataTypes.BOOLEAN, allowNull: false },
      services: { type: DataTypes.INTEGER, allowNull: false },
      lastServiceAt: { type: DataTypes.DATE, allowNull: true },
      computedAt: { type: DataTypes.DATE, allowNull: false },
    }, { sequelize, tableName: 'unit_trends', underscored: true, timestamps: false })
  }
}
