import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { TokenScope } from '../../shared/types/api-token'

/** An API token: another system calls the API as `userId`, within `scopes`, until it expires or is revoked. */
export class ApiToken extends Model<InferAttributes<ApiToken>, InferCreationAttributes<ApiToken>> {
  declare id: CreationOptional<number>
  declare userId: ForeignKey<number>
  declare name: string
  declare prefix: string
  declare tokenHash: string
  declare scopes: TokenScope[]
  declare expiresAt: Date
  declare revokedAt: CreationOptional<Date | null>
  declare lastUsedAt: CreationOptional<Date | null>
  declare createdById: number
  declare createdAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    ApiToken.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      name: { type: DataTypes.STRING(80), allowNull: false },
      prefix: { type: DataTypes.STRING(16), allowNull: false },
      tokenHash: { type: DataTypes.STRING(64), allowNull: false, unique: true },
      scopes: { type: DataTypes.JSON, allowNull: false },
      expiresAt: { type: DataTypes.DATE, allowNull: false },
      revokedAt: { type: DataTypes.DATE, allowNull: true },
      lastUsedAt: { type: DataTypes.DATE, allowNull: true },
      createdById: { type: DataTypes.INTEGER, allowNull: false },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'api_tokens', underscored: true, updatedAt: false })
  }
}
