import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize'

export type SessionEndReason = 'signed-out' | 'ended-by-user' | 'signed-out-everywhere' | 'password-changed' | 'password-reset' | 'disabled' | 'roles-changed' | 'reauthentication-locked'

/** One signed-in device: the sealed session cookie carries `token`; the row says whether it still counts. */
export class UserSession extends Model<InferAttributes<UserSession>, InferCreationAttributes<UserSession>> {
  declare id: CreationOptional<number>
  declare token: string
  declare userId: ForeignKey<number>
  /** The user's session version when it began; a bump ends it. */
  declare sessionVersion: number
  declare userAgent: string | null
  declare address: string | null
  declare createdAt: CreationOptional<Date>
  declare lastSeenAt: Date
  declare endedAt: Date | null
  declare endReason: SessionEndReason | null

  static initModel(sequelize: Sequelize): void {
    UserSession.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      token: { type: DataTypes.STRING(64), allowNull: false, unique: true },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      sessionVersion: { type: DataTypes.INTEGER, allowNull: false },
      userAgent: { type: DataTypes.STRING(300), allowNull: true },
      address: { type: DataTypes.STRING(64), allowNull: true },
      createdAt: DataTypes.DATE,
      lastSeenAt: { type: DataTypes.DATE, allowNull: false },
      endedAt: { type: DataTypes.DATE, allowNull: true },
      endReason: { type: DataTypes.STRING(40), allowNull: true },
    }, { sequelize, tableName: 'user_sessions', underscored: true, updatedAt: false })
  }
}
