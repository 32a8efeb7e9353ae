import { idParamsSchema } from '../../../../shared/schemas/auth'
import { reasonSchema } from '../../../../shared/schemas/worksheet'
import type { WorksheetContent } from '../../../../shared/types/worksheet'
import { User } from '../../../models'
import { returnWorksheet } from '../../../services/worksheets'

/** Returns a worksheet to its performer with a reason; it keeps its history and can be corrected and signed again. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'inspector')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(reasonSchema))
  const worksheet = await returnWorksheet(user, id, reason, expectedVersion(event))
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
  return worksheetAnswer(event, id)
})
