import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { WebhookDeliveryStatus, WebhookEventType } from '../../shared/types/webhook'

/** Where another system hears of events: a URL, the events it takes, and the secret its messages are signed with. */
export class WebhookEndpoint extends Model<InferAttributes<WebhookEndpoint>, InferCreationAttributes<WebhookEndpoint>> {
  declare id: CreationOptional<number>
  declare url: string
  declare description: string
  declare events: WebhookEventType[]
  declare secret: string
  declare active: CreationOptional<boolean>
  declare createdById: number
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>

  static initModel(sequelize: Sequelize): void {
    WebhookEndpoint.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      url: { type: DataTypes.STRING(500), allowNull: false },
      description: { type: DataTypes.STRING(200), allowNull: false },
      events: { type: DataTypes.JSON, allowNull: false },
      secret: { type: DataTypes.STRING(100), allowNull: false },
      active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
      createdById: { type: DataTypes.INTEGER, allowNull: false },
      createdAt: DataTypes.DATE,
      updatedAt: DataTypes.DATE,
    }, { sequelize, tableName: 'webhook_endpoints', underscored: true })
  }
}

/** One event for one endpoint: written with the write that caused it, sent in the background until it is taken. */
export class WebhookDelivery extends Model<InferAttributes<WebhookDelivery>, InferCreationAttributes<WebhookDelivery>> {
  declare id: CreationOptional<number>
  declare endpointId: ForeignKey<number>
  declare eventType: WebhookEventType
  /** The `webhook-id` header: the same on every attempt and replay, for the receiver to take each message once. */
  declare messageId: string
  /** What the event is about ("worksheet:12"): deliveries of one subject to one endpoint are sent in order. */
  declare subject: string
  declare payload: string
  declare status: WebhookDeliveryStatus
  declare attempts: CreationOptional<number>
  declare nextAttemptAt: Date | null
  declare lastAttemptAt: CreationOptional<Date | null>
  declare deliveredAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare endpoint?: NonAttribute<WebhookEndpoint>
  declare history?: NonAttribute<WebhookAttempt[]>

  static initModel(sequelize: Sequelize): void {
    WebhookDelivery.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      endpointId: { type: DataTypes.INTEGER, allowNull: false },
      eventType: { type: DataTypes.STRING(40), allowNull: false },
      messageId: { type: DataTypes.STRING(100), allowNull: false },
      subject: { type: DataTypes.STRING(80), allowNull: false },
      payload: { type: DataTypes.TEXT, allowNull: false },
      status: { type: DataTypes.STRING(10), allowNull: false },
      attempts: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
      nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
      lastAttemptAt: { type: DataTypes.DATE, allowNull: true },
      deliveredAt: { type: DataTypes.DATE, allowNull: true },
      createdAt: DataTypes.DATE,
    }, { sequelize, tableName: 'webhook_deliveries', underscored: true, updatedAt: false })
  }
}

/** One try at a delivery: when, the receiver's HTTP status (or why there was none), how long it took. */
export class WebhookAttempt extends Model<InferAttributes<WebhookAttempt>, InferCreationAttributes<WebhookAttempt>> {
  declare id: CreationOptional<number>
  declare deliveryId: ForeignKey<number>
  declare attemptedAt: Date
  declare statusCode: number | null
  declare error: string | null
  declare durationMs: number

  static initModel(sequelize: Sequelize): void {
    WebhookAttempt.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      deliveryId: { type: DataTypes.INTEGER, allowNull: false },
      attemptedAt: { type: DataTypes.DATE, allowNull: false },
      statusCode: { type: DataTypes.INTEGER, allowNull: true },
      error: { type: DataTypes.TEXT, allowNull: true },
      durationMs: { type: DataTypes.INTEGER, allowNull: false },
    }, { sequelize, tableName: 'webhook_attempts', underscored: true, timestamps: false })
  }
}
