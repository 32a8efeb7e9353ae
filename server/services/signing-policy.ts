import { DEFAULT_SIGNING_POLICY, type SigningPolicy } from '#shared/types/signing'
import { appendAudit } from '../database/audit-chain'
import { Setting, type User } from '../models'

/** How each role signs: the organisation's choice (an administrator's, audited); either until chosen. */
const KEY = 'signing-policy'

export async function signingPolicy(): Promise<SigningPolicy & { updatedAt: string | null }> {
  const row = await Setting.findByPk(KEY)
  const chosen = row?.value as Partial<SigningPolicy> | undefined
  return { ...DEFAULT_SIGNING_POLICY, ...chosen, updatedAt: row?.updatedAt.toISOString() ?? null }
}

export async function setSigningPolicy(
  admin: User,
  policy: SigningPolicy,
): Promise<SigningPolicy & { updatedAt: string | null }> {
  await writeTransaction(async (transaction) => {
    const row = await Setting.findByPk(KEY, { transaction, lock: transaction.LOCK.UPDATE })
    const before = { ...DEFAULT_SIGNING_POLICY, ...(row?.value as Partial<SigningPolicy> | undefined) }
    const now = new Date()
    if (row) await row.update({ value: policy, updatedAt: now, updatedById: admin.id }, { transaction })
    else await Setting.create({ key: KEY, value: policy, updatedAt: now, updatedById: admin.id }, { transaction })
    await appendAudit({ actorId: admin.id, entity: 'setting', entityId: KEY, action: 'signing-policy-changed', detail: { from: before, to: policy } }, transaction, {})
  })
  return signingPolicy()
}
