import { DataTypes, Model, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/**
 * A hydraulic system's pump-cycle trend as last computed (after each check recorded, corrected or
 * withdrawn): one row per system, so the Trends page never reads every check of the fleet.
 */
export class SystemCycleTrend
  extends Model<InferAttributes<SystemCycleTrend>, InferCreationAttributes<SystemCycleTrend>> {
  declare aircraftId: ForeignKey<number>
  declare system: string
  declare accumulatorId: number
  declare registration: string
  declare checks: number
  declare baselineSeconds: number | null
  declare latestSeconds: number | null
  declare latestLeakRate: { value: number, unit: string } | null
  declare drop: number | null
  /** The table's order: the drop, or −1e9 without one (largest first). */
  declare rank: number
  declare flagged: boolean
  declare message: string | null
  declare firstCheckedAt: Date | null
  declare lastCheckedAt: Date | null
  declare computedAt: Date

  static initModel(sequelize: Sequelize): void {
    SystemCycleTrend.init({
      aircraftId: { type: DataTypes.INTEGER, primaryKey: true },
      system: { type: DataTypes.STRING(80), primaryKey: true },
      accumulatorId: { type: DataTypes.INTEGER, allowNull: false },
      registration: { type: DataTypes.STRING(20), allowNull: false },
      checks: { type: DataTypes.INTEGER, allowNull: false },
      baselineSeconds: { type: DataTypes.FLOAT, allowNull: true },
      latestSeconds: { type: DataTypes.FLOAT, allowNull: true },
      latestLeakRate: { type: DataTypes.JSON, allowNull: true },
      drop: { type: DataTypes.FLOAT, allowNull: true },
      rank: { type: DataTypes.FLOAT, allowNull: false },
      flagged: { type: DataTypes.BOOLEAN, allowNull: false },
      message: { type: DataTypes.TEXT, allowNull: true },
      firstCheckedAt: { type: DataTypes.DATE, allowNull: true },
      lastCheckedAt: { type: DataTypes.DATE, allowNull: true },
      computedAt: { type: DataTypes.DATE, allowNull: false },
    }, { sequelize, tableName: 'cycle_trends', underscored: true, timestamps: false })
  }
}
