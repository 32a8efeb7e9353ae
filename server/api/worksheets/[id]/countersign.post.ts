import { idParamsSchema } from '../../../../shared/schemas/auth'
import { signatureSchema } from '../../../../shared/schemas/worksheet'
import { INSPECTOR_STATEMENT } from '../../../../shared/types/worksheet'
import { canInspect } from '../../../../shared/utils/worksheet-rules'
import { appendAudit } from '../../../database/audit-chain'
import { Signature } from '../../../models'

/** Independent inspection: an inspector who did not do the work countersigns, and the record is released. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'inspector')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(signatureSchema))
  const worksheet = await findWorksheet(id)
  enforce(canInspect(user, worksheet))
  await confirmPassword(user, password)
  const now = new Date()
  const sequelize = await useDB()
  await sequelize.transaction(async (transaction) => {
    await worksheet.update({ state: 'released', releasedAt: now }, { transaction })
    await Signature.create({ worksheetId: worksheet.id, userId: user.id, capacity: 'inspector', name: user.name, authorisationNumber: user.authorisationNumber, statement: INSPECTOR_STATEMENT, signedAt: now }, { transaction })
    await appendAudit({ at: now, actorId: user.id, entity: 'worksheet', entityId: String(worksheet.id), action: 'countersigned', detail: { performerId: worksheet.performerId } }, transaction)
  })
  // A released as-found may change a unit's trend.
  await evaluateTrendAlerts()
  return toWorksheetDto(await findWorksheet(id))
})
