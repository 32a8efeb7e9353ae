import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { StudyInput } from '../../shared/schemas/study'
import type { StudyResults } from '../../shared/utils/study'
import type { Specification } from './specification'

export class SizingStudy extends Model<InferAttributes<SizingStudy>, InferCreationAttributes<SizingStudy>> {
  declare id: CreationOptional<number>
  declare name: string
  declare specificationId: ForeignKey<number> | null
  declare inputs: StudyInput
  declare results: StudyResults
  declare engineVersion: string
  declare createdById: ForeignKey<number>
  declare updatedById: ForeignKey<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare specification?: NonAttribute<Specification>

  static initModel(sequelize: Sequelize): void {
    SizingStudy.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      name: { type: DataTypes.STRING(160), allowNull: false },
      specificationId: { type: DataTypes.INTEGER, allowNull: true },
      inputs: { type: DataTypes.JSON, allowNull: false },
      results: { type: DataTypes.JSON, allowNull: false },
      engineVersion: { type: DataTypes.STRING(20), allowNull: false },
      createdById: { type: DataTypes.INTEGER, allowNull: false },
      updatedById: { type: DataTypes.INTEGER, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'sizing_studies', underscored: true })
  }
}
