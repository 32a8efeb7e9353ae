import { DataTypes, Model, type CreationOptional, type ForeignKey, type InferAttributes, type InferCreationAttributes, type NonAttribute, type Sequelize } from 'sequelize'
import type { Passkey } from './passkey'

import type { FrozenAuthorisation } from '../../shared/types/authorisation'
import type { SignatureAssertion, SigningPayload, SignatureMethod } from '../../shared/types/signing'
import type { SignatureCapacity } from '../../shared/types/worksheet'

/** An electronic signature: who, in what capacity, to what statement, when, in which round. Never updated. */
export class Signature extends Model<InferAttributes<Signature>, InferCreationAttributes<Signature>> {
  declare id: CreationOptional<number>
  declare worksheetId: ForeignKey<number>
  declare userId: ForeignKey<number>
  declare capacity: SignatureCapacity
  declare name: string
  declare authorisationNumber: string | null
  declare statement: string
  declare signedAt: Date
  /** The worksheet's signing round; one performer and one inspector signature per round (unique in the database). */
  declare round: number
  /** password or passkey; null on signatures made before passkeys existed (all by password). */
  declare method: CreationOptional<SignatureMethod | null>
  declare passkeyId: CreationOptional<ForeignKey<number> | null>
  /** What was signed: the payload whose SHA-256 was the WebAuthn challenge (passkey signatures). */
  declare payload: CreationOptional<SigningPayload | null>
  /** The SHA-256 of each field of the record's canonical content when it was signed (names a changed field). */
  declare signedFields: CreationOptional<Record<string, string> | null>
  declare assertion: CreationOptional<SignatureAssertion | null>
  declare passkey?: NonAttribute<Passkey | null>
  /** The certifying authorisation the signature was made under, frozen; null before the register existed. */
  declare authorisation: CreationOptional<FrozenAuthorisation | null>

  static initModel(sequelize: Sequelize): void {
    Signature.init({
      id: { type: DataTypes.INTEGER, primaryKey: true, autoIncrement: true },
      worksheetId: { type: DataTypes.INTEGER, allowNull: false },
      userId: { type: DataTypes.INTEGER, allowNull: false },
      capacity: { type: DataTypes.STRING(20), allowNull: false },
      name: { type: DataTypes.STRING(120), allowNull: false },
      authorisationNumber: { type: DataTypes.STRING(40), allowNull: true },
      statement: { type: DataTypes.TEXT, allowNull: false },
      signedAt: { type: DataTypes.DATE, allowNull: false },
      round: { type: DataTypes.INTEGER, allowNull: false },
      method: { type: DataTypes.STRING(20), allowNull: true },
      passkeyId: { type: DataTypes.INTEGER, allowNull: true },
      payload: { type: DataTypes.JSON, allowNull: true },
      signedFields: { type: DataTypes.JSON, allowNull: true },
      assertion: { type: DataTypes.JSON, allowNull: true },
      authorisation: { type: DataTypes.JSON, allowNull: true },
    }, { sequelize, tableName: 'signatures', underscored: true, timestamps: false })
  }
}
