import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

/** A stored file (gauge photo, certificate); the bytes live in the uploads storage under `storageKey`. */
export class Attachment extends Model<InferAttributes<Attachment>, InferCreationAttributes<Attachment>> {
  declare id: CreationOptional<number>
  declare worksheetId: ForeignKey<number> | null
  declare kind: string
  declare originalName: string
  declare mimeType: string
  declare sizeBytes: number
  declare storageKey: string
  declare uploadedById: ForeignKey<number>
  /** SHA-256 of the stored bytes, part of the worksheet's record hash. */
  declare sha256: string | null
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    Attachment.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      worksheetId: { type: DataTypes.INTEGER, allowNull: true },
      kind: { type: DataTypes.STRING(30), allowNull: false },
      originalName: { type: DataTypes.STRING(200), allowNull: false },
      mimeType: { type: DataTypes.STRING(60), allowNull: false },
      sizeBytes: { type: DataTypes.INTEGER, allowNull: false },
      storageKey: { type: DataTypes.STRING(200), allowNull: false, unique: true },
      uploadedById: { type: DataTypes.INTEGER, allowNull: false },
      sha256: { type: DataTypes.STRING(64), allowNull: true },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'attachments', underscored: true, updatedAt: false })
  }
}
