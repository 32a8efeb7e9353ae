import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type Sequelize,
} from 'sequelize'

/** One period an accumulator spent at one aircraft position: its movement history. */
export class AccumulatorInstallation extends Model<
  InferAttributes<AccumulatorInstallation>,
  InferCreationAttributes<AccumulatorInstallation>
> {
  declare id: CreationOptional<number>
  declare accumulatorId: ForeignKey<number>
  declare aircraftId: ForeignKey<number>
  declare position: string
  declare installedAt: string
  declare removedAt: string | null
  declare removalReason: string | null

  static initModel(sequelize: Sequelize): void {
    AccumulatorInstallation.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        accumulatorId: { type: DataTypes.INTEGER, allowNull: false },
        aircraftId: { type: DataTypes.INTEGER, allowNull: false },
        position: { type: DataTypes.STRING(80), allowNull: false },
        installedAt: { type: DataTypes.DATEONLY, allowNull: false },
        removedAt: { type: DataTypes.DATEONLY, allowNull: true },
        removalReason: { type: DataTypes.STRING(200), allowNull: true },
      },
      { sequelize, tableName: 'accumulator_installations', underscored: true, timestamps: false },
    )
  }
}
