import type { Sequelize } from 'sequelize'
import { Accumulator } from './accumulator'
import { ApiToken } from './api-token'
import { AccumulatorInstallation } from './accumulator-installation'
import { Aircraft } from './aircraft'
import { Attachment } from './attachment'
import { Authorisation } from './authorisation'
import { AuditEvent } from './audit-event'
import { AuditHead } from './audit-head'
import { CycleCheck } from './cycle-check'
import { LoginAttempt } from './login-attempt'
import { Notification } from './notification'
import { Operator } from './operator'
import { Passkey } from './passkey'
import { PrechargeReading } from './precharge-reading'
import { Setting } from './setting'
import { Signature } from './signature'
import { SizingStudy } from './sizing-study'
import { Specification } from './specification'
import { SystemCycleTrend } from './system-cycle-trend'
import { SpecificationTablePoint } from './specification-table-point'
import { Station } from './station'
import { Tool } from './tool'
import { TrendAlert } from './trend-alert'
import { UnitTrend } from './unit-trend'
import { User } from './user'
import { UserSession } from './user-session'
import { WebhookAttempt, WebhookDelivery, WebhookEndpoint } from './webhook'
import { listColumns, Worksheet } from './worksheet'

export {
  Accumulator,
  ApiToken,
  AccumulatorInstallation,
  Aircraft,
  Attachment,
  Authorisation,
  AuditEvent,
  AuditHead,
  CycleCheck,
  LoginAttempt,
  Notification,
  Operator,
  Passkey,
  PrechargeReading,
  Setting,
  Signature,
  SizingStudy,
  Specification,
  SpecificationTablePoint,
  Station,
  SystemCycleTrend,
  Tool,
  TrendAlert,
  UnitTrend,
  User,
  UserSession,
  WebhookAttempt,
  WebhookDelivery,
  WebhookEndpoint,
  Worksheet,
  listColumns,
}

/** Registers every model and association on a connection. */
export function initModels(sequelize: Sequelize): void {
  for (const model of [
    User,
    LoginAttempt,
    Station,
    Operator,
    Aircraft,
    Specification,
    SpecificationTablePoint,
    Accumulator,
    AccumulatorInstallation,
    Tool,
    Passkey,
    ApiToken,
    Setting,
    Authorisation,
    Worksheet,
    Signature,
    Attachment,
    AuditEvent,
    AuditHead,
    SizingStudy,
    Notification,
    CycleCheck,
    TrendAlert,
    UserSession,
    PrechargeReading,
    UnitTrend,
    SystemCycleTrend,
    WebhookEndpoint,
    WebhookDelivery,
    WebhookAttempt,
  ])
    model.initModel(sequelize)

  Specification.hasMany(SpecificationTablePoint, { as: 'tablePoints', foreignKey: 'specificationId' })
  Specification.belongsTo(Specification, { as: 'supersedes', foreignKey: 'supersedesId' })
  Aircraft.belongsTo(Operator, { as: 'operator', foreignKey: 'operatorId' })
  Aircraft.hasMany(Accumulator, { as: 'accumulators', foreignKey: 'aircraftId' })
  Accumulator.belongsTo(Aircraft, { as: 'aircraft', foreignKey: 'aircraftId' })
  Accumulator.hasMany(AccumulatorInstallation, { as: 'installations', foreignKey: 'accumulatorId' })
  AccumulatorInstallation.belongsTo(Aircraft, { as: 'aircraft', foreignKey: 'aircraftId' })
  Worksheet.belongsTo(Accumulator, { as: 'accumulator', foreignKey: 'accumulatorId' })
  Worksheet.belongsTo(Aircraft, { as: 'aircraft', foreignKey: 'aircraftId' })
  Worksheet.belongsTo(Specification, { as: 'specification', foreignKey: 'specificationId' })
  Worksheet.belongsTo(User, { as: 'performer', foreignKey: 'performerId' })
  Worksheet.belongsTo(Worksheet, { as: 'corrects', foreignKey: 'correctsId' })
  Worksheet.hasMany(Signature, { as: 'signatures', foreignKey: 'worksheetId' })
  Worksheet.hasMany(Attachment, { as: 'attachments', foreignKey: 'worksheetId' })
  Signature.belongsTo(User, { as: 'user', foreignKey: 'userId' })
  Signature.belongsTo(Passkey, { as: 'passkey', foreignKey: 'passkeyId' })
  User.hasMany(Passkey, { as: 'passkeys', foreignKey: 'userId' })
  ApiToken.belongsTo(User, { as: 'user', foreignKey: 'userId' })
  Authorisation.belongsTo(User, { as: 'holder', foreignKey: 'holderId' })
  SizingStudy.belongsTo(Specification, { as: 'specification', foreignKey: 'specificationId' })
  CycleCheck.belongsTo(Aircraft, { as: 'aircraft', foreignKey: 'aircraftId' })
  CycleCheck.belongsTo(Accumulator, { as: 'accumulator', foreignKey: 'accumulatorId' })
  UserSession.belongsTo(User, { as: 'user', foreignKey: 'userId' })
  Accumulator.hasOne(UnitTrend, { as: 'trend', foreignKey: 'accumulatorId' })
  UnitTrend.belongsTo(Accumulator, { as: 'accumulator', foreignKey: 'accumulatorId' })
  PrechargeReading.belongsTo(Worksheet, { as: 'worksheet', foreignKey: 'worksheetId' })
  WebhookDelivery.belongsTo(WebhookEndpoint, { as: 'endpoint', foreignKey: 'endpointId' })
  WebhookDelivery.hasMany(WebhookAttempt, { as: 'history', foreignKey: 'deliveryId' })
}
