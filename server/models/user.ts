import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'
import type { Role, UserPreferences } from '../../shared/types/user'

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>
  declare email: string
  declare name: string
  declare passwordHash: string
  declare roles: Role[]
  declare authorisationNumber: string | null
  declare disabled: CreationOptional<boolean>
  declare preferences: UserPreferences
  /** The stations (ids) whose aircraft the user may see; empty: every station. Administrators see all. */
  declare stationIds: CreationOptional<number[] | null>
  /** The operators (ids) whose aircraft the user may see; empty: every operator. */
  declare operatorIds: CreationOptional<number[] | null>
  /** Bumped to end every session of this user at once (password, roles, disabling, sign out everywhere). */
  declare sessionVersion: CreationOptional<number>
  /** The identity provider's subject (`sub`) for this user, linked at their first single sign-on. */
  declare oidcSubject: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    User.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
      name: { type: DataTypes.STRING(120), allowNull: false },
      passwordHash: { type: DataTypes.STRING(255), allowNull: false },
      roles: { type: DataTypes.JSON, allowNull: false },
      authorisationNumber: { type: DataTypes.STRING(40), allowNull: true },
      disabled: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: false },
      preferences: { type: DataTypes.JSON, allowNull: false },
      stationIds: { type: DataTypes.JSON, allowNull: true },
      operatorIds: { type: DataTypes.JSON, allowNull: true },
      sessionVersion: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
      oidcSubject: { type: DataTypes.STRING(255), allowNull: true, unique: true },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'users', underscored: true })
  }

  /** What the API may show of a user: never the password hash. */
  toPublic() {
    return {
      id: this.id,
      email: this.email,
      name: this.name,
      roles: this.roles,
      authorisationNumber: this.authorisationNumber,
      disabled: this.disabled,
      preferences: this.preferences,
      stationIds: this.stationIds ?? null,
      operatorIds: this.operatorIds ?? null,
    }
  }
}
