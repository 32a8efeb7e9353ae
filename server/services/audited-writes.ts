import type { CreationAttributes, Model, ModelStatic, Transaction } from 'sequelize'
import type { RecordKindName } from '../database/record-hash'
import { appendAudit } from '../database/audit-chain'
import type { User } from '../models'

/**
 * The write every register record shares: the change and its audit entry in one transaction, a
 * clash with a unique column answered 409 with a plain reason, a missing record 404.
 */

export function notFound(what: string): never {
  throw createError({ status: 404, statusMessage: 'Not Found', message: `${what} not found.` })
}

export function unprocessable(message: string, field?: string): never {
  throw createError({
    status: 422,
    statusMessage: 'Unprocessable Entity',
    message,
    data: field ? { field, issues: [{ path: field.split('.'), field, message }] } : undefined,
  })
}

export async function findOr404<M extends Model>(
  model: ModelStatic<M>,
  id: number,
  what: string,
  options: object = {},
): Promise<M> {
  const found = await model.findByPk(id, options)
  return found ?? notFound(what)
}

interface AuditedWrite {
  actor: Pick<User, 'id'>
  entity: RecordKindName
  action: string
  detail: object
  conflict: string
}

/** Creates a record and audits it. */
export function createAudited<M extends Model>(
  model: ModelStatic<M>,
  fields: CreationAttributes<M>,
  write: AuditedWrite,
): Promise<M> {
  return uniqueOr409(
    () =>
      writeTransaction(async (transaction: Transaction) => {
        const created = await model.create(fields, { transaction })
        await appendAudit(
          {
            actorId: write.actor.id,
            entity: write.entity,
            entityId: String(created.get('id')),
            action: write.action,
            detail: { ...write.detail },
          },
          transaction,
        )
        return created
      }),
    write.conflict,
  )
}

/** Changes a record and audits the change. */
export function updateAudited<M extends Model>(
  record: M,
  changes: Partial<M['_attributes']>,
  write: AuditedWrite,
): Promise<M> {
  return uniqueOr409(
    () =>
      writeTransaction(async (transaction: Transaction) => {
        await record.update(changes, { transaction })
        await appendAudit(
          {
            actorId: write.actor.id,
            entity: write.entity,
            entityId: String(record.get('id')),
            action: write.action,
            detail: { ...write.detail },
          },
          transaction,
        )
        return record
      }),
    write.conflict,
  )
}
