import { idParamsSchema } from '../../../../shared/schemas/auth'
import { reasonSchema } from '../../../../shared/schemas/worksheet'
import type { WorksheetContent } from '../../../../shared/types/worksheet'
import { canInspect } from '../../../../shared/utils/worksheet-rules'
import { appendAudit } from '../../../database/audit-chain'
import { User } from '../../../models'

/** Returns a worksheet to its performer with a reason; it keeps its history and can be corrected and signed again. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'inspector')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(reasonSchema))
  const worksheet = await findWorksheet(id)
  enforce(canInspect(user, worksheet))
  const sequelize = await useDB()
  await sequelize.transaction(async (transaction) => {
    await worksheet.update({ state: 'returned', returnReason: reason, submittedAt: null }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'worksheet', entityId: String(worksheet.id), action: 'returned', detail: { reason } }, transaction)
  })
  const performer = await User.findByPk(worksheet.performerId)
  const content = worksheet.content as unknown as WorksheetContent
  if (performer) {
    await sendMail({
      to: performer.email,
      kind: 'returned',
      worksheetId: worksheet.id,
      subject: `Worksheet ${worksheet.id} returned — ${content.aircraft.registration}, ${content.accumulator.position}`,
      text: `${user.name} returned worksheet ${worksheet.id} (work order ${worksheet.workOrder}) to you.\n\nReason: ${reason}\n\nCorrect it and sign again: ${useRuntimeConfig().publicUrl}/worksheets/${worksheet.id}`,
    })
  }
  return toWorksheetDto(await findWorksheet(id))
})
