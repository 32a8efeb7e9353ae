import {
  DataTypes,
  Model,
  type CreationOptional,
  type ForeignKey,
  type InferAttributes,
  type InferCreationAttributes,
  type NonAttribute,
  type Sequelize,
} from 'sequelize'
import type { WorksheetContent, WorksheetReason, WorksheetResults, WorksheetState } from '../../shared/types/worksheet'
import type { Signature } from './signature'

/** The list's columns as the content and results give them; set on every write that changes either. */
export function listColumns(
  content: WorksheetContent | Record<string, unknown>,
  results: WorksheetResults | Record<string, unknown>,
) {
  const frozen = content as {
    aircraft?: { registration?: string, fleetNumber?: string }
    accumulator?: { position?: string, partNumber?: string, serialNumber?: string }
    tools?: { gauge?: { id?: number }, cart?: { id?: number } }
  }
  const computed = results as {
    asFound?: { assessment?: { verdict?: string } }
    asLeft?: { assessment?: { verdict?: string } }
  }
  return {
    registration: frozen.aircraft?.registration ?? null,
    fleetNumber: frozen.aircraft?.fleetNumber ?? null,
    position: frozen.accumulator?.position ?? null,
    partNumber: frozen.accumulator?.partNumber ?? null,
    serialNumber: frozen.accumulator?.serialNumber ?? null,
    asFoundVerdict: computed.asFound?.assessment?.verdict ?? null,
    asLeftVerdict: computed.asLeft?.assessment?.verdict ?? null,
    gaugeId: frozen.tools?.gauge?.id ?? null,
    cartId: frozen.tools?.cart?.id ?? null,
  }
}

/**
 * A servicing record. `content` holds what the performer entered, step by step; `results`
 * the engine's results, recomputed by the server and frozen at signing with the engine version.
 */
export class Worksheet extends Model<InferAttributes<Worksheet>, InferCreationAttributes<Worksheet>> {
  declare id: CreationOptional<number>
  declare state: WorksheetState
  declare accumulatorId: ForeignKey<number>
  declare aircraftId: ForeignKey<number>
  declare specificationId: ForeignKey<number>
  declare performerId: ForeignKey<number>
  declare correctsId: ForeignKey<number> | null
  declare workOrder: string
  declare reason: WorksheetReason
  declare content: WorksheetContent
  declare results: WorksheetResults
  declare engineVersion: string
  declare serviceable: boolean | null
  declare returnReason: string | null
  declare voidReason: string | null
  declare voidedById: ForeignKey<number> | null
  declare performedAt: Date | null
  declare submittedAt: Date | null
  declare releasedAt: Date | null
  /** Row version: every write names the version it read and bumps it (compare-and-set). */
  declare version: CreationOptional<number>
  /** Signing round: 1 at the start, one more each time the record is returned to its performer. */
  declare round: CreationOptional<number>
  // What the worksheet list shows, frozen from content and results (see listColumns): the
  // list reads these, never the JSON.
  declare registration: CreationOptional<string | null>
  declare fleetNumber: CreationOptional<string | null>
  declare position: CreationOptional<string | null>
  declare partNumber: CreationOptional<string | null>
  declare serialNumber: CreationOptional<string | null>
  declare asFoundVerdict: CreationOptional<string | null>
  declare asLeftVerdict: CreationOptional<string | null>
  declare gaugeId: CreationOptional<number | null>
  declare cartId: CreationOptional<number | null>
  /** The id a device gave a worksheet it started without a connection (a sync sent twice creates it once). */
  declare clientId: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
  declare signatures?: NonAttribute<Signature[]>

  static initModel(sequelize: Sequelize): void {
    Worksheet.init(
      {
        id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
        state: { type: DataTypes.STRING(24), allowNull: false },
        accumulatorId: { type: DataTypes.INTEGER, allowNull: false },
        aircraftId: { type: DataTypes.INTEGER, allowNull: false },
        specificationId: { type: DataTypes.INTEGER, allowNull: false },
        performerId: { type: DataTypes.INTEGER, allowNull: false },
        correctsId: { type: DataTypes.INTEGER, allowNull: true },
        workOrder: { type: DataTypes.STRING(60), allowNull: false },
        reason: { type: DataTypes.STRING(30), allowNull: false },
        content: { type: DataTypes.JSON, allowNull: false },
        results: { type: DataTypes.JSON, allowNull: false },
        engineVersion: { type: DataTypes.STRING(20), allowNull: false },
        serviceable: { type: DataTypes.BOOLEAN, allowNull: true },
        returnReason: { type: DataTypes.TEXT, allowNull: true },
        voidReason: { type: DataTypes.TEXT, allowNull: true },
        voidedById: { type: DataTypes.INTEGER, allowNull: true },
        performedAt: { type: DataTypes.DATE, allowNull: true },
        submittedAt: { type: DataTypes.DATE, allowNull: true },
        releasedAt: { type: DataTypes.DATE, allowNull: true },
        registration: { type: DataTypes.STRING(20), allowNull: true },
        fleetNumber: { type: DataTypes.STRING(20), allowNull: true },
        position: { type: DataTypes.STRING(80), allowNull: true },
        partNumber: { type: DataTypes.STRING(60), allowNull: true },
        serialNumber: { type: DataTypes.STRING(60), allowNull: true },
        asFoundVerdict: { type: DataTypes.STRING(12), allowNull: true },
        asLeftVerdict: { type: DataTypes.STRING(12), allowNull: true },
        gaugeId: { type: DataTypes.INTEGER, allowNull: true },
        cartId: { type: DataTypes.INTEGER, allowNull: true },
        clientId: { type: DataTypes.STRING(36), allowNull: true },
        version: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        round: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 1 },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      {
        sequelize,
        tableName: 'worksheets',
        underscored: true,
        hooks: {
          beforeSave: (worksheet) => {
            if (worksheet.changed('content') || worksheet.changed('results') || worksheet.isNewRecord)
              Object.assign(worksheet, listColumns(worksheet.content, worksheet.results))
          },
        },
      },
    )
  }
}
