import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { AuthorisationPrivileges, AuthorisationScopeKind } from '../../shared/types/authorisation'
import type { User } from './user'

/**
 * A certifying authorisation in the organisation's register: what its holder may certify (perform,
 * inspect or both; part numbers or aircraft types) and when. Signing checks it; a signature freezes it.
 * Suspended with a reason, never deleted.
 */
export class Authorisation extends Model<InferAttributes<Authorisation>, InferCreationAttributes<Authorisation>> {
  declare id: CreationOptional<number>
  declare holderId: ForeignKey<number>
  declare number: string
  declare privileges: AuthorisationPrivileges
  declare scopeKind: AuthorisationScopeKind
  declare scope: string[]
  /** Calendar dates at the station, YYYY-MM-DD. */
  declare issuedOn: string
  declare expiresOn: string
  declare issuingBody: string
  declare suspendedAt: Date | null
  declare suspendedReason: string | null
  /** When the holder and administrators were told it expires within 30 days. */
  declare expiryNoticeSentAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare holder?: NonAttribute<User>

  static initModel(sequelize: Sequelize): void {
    Authorisation.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      holderId: { type: DataTypes.INTEGER, allowNull: false },
      number: { type: DataTypes.STRING(40), allowNull: false, unique: true },
      privileges: { type: DataTypes.STRING(10), allowNull: false },
      scopeKind: { type: DataTypes.STRING(20), allowNull: false },
      scope: { type: DataTypes.JSON, allowNull: false },
      issuedOn: { type: DataTypes.STRING(10), allowNull: false },
      expiresOn: { type: DataTypes.STRING(10), allowNull: false },
      issuingBody: { type: DataTypes.STRING(120), allowNull: false },
      suspendedAt: { type: DataTypes.DATE, allowNull: true },
      suspendedReason: { type: DataTypes.TEXT, allowNull: true },
      expiryNoticeSentAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'authorisations', underscored: true })
  }
}
