import { idParamsSchema } from '../../../../shared/schemas/auth'
import { reasonSchema } from '../../../../shared/schemas/worksheet'
import { canVoid } from '../../../../shared/utils/worksheet-rules'
import { appendAudit } from '../../../database/audit-chain'

/** Voids a worksheet with a reason (inspector or admin). The record stays, readable, marked voided. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'inspector', 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(reasonSchema))
  const worksheet = await findWorksheet(id)
  enforce(canVoid(user, worksheet))
  const previousState = worksheet.state
  const sequelize = await useDB()
  await sequelize.transaction(async (transaction) => {
    await worksheet.update({ state: 'voided', voidReason: reason, voidedById: user.id }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'worksheet', entityId: String(worksheet.id), action: 'voided', detail: { reason, previousState } }, transaction)
  })
  return toWorksheetDto(await findWorksheet(id))
})
