import { Op } from 'sequelize'
import { idParamsSchema } from '../../../../shared/schemas/auth'
import { signatureSchema } from '../../../../shared/schemas/worksheet'
import type { WorksheetContent } from '../../../../shared/types/worksheet'
import { User } from '../../../models'
import { signWorksheet } from '../../../services/worksheets'

/** The performer signs (password re-entered): results are recomputed and frozen, and inspectors are told. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(signatureSchema))
  const worksheet = await signWorksheet(user, id, password, expectedVersion(event))
  const content = worksheet.content as unknown as WorksheetContent
  const inspectors = (await User.findAll({ where: { disabled: false, id: { [Op.ne]: user.id } } })).filter(candidate => candidate.roles.includes('inspector'))
  const link = `${useRuntimeConfig().publicUrl}/worksheets/${worksheet.id}`
  await Promise.all(inspectors.map(inspector => sendMail({
    to: inspector.email,
    kind: 'awaiting-countersign',
    worksheetId: worksheet.id,
    subject: `Worksheet ${worksheet.id} awaits countersign — ${content.aircraft.registration}, ${content.accumulator.position}`,
    text: `${user.name} signed worksheet ${worksheet.id} (work order ${worksheet.workOrder}) for ${content.aircraft.registration}, ${content.accumulator.position}, P/N ${content.accumulator.partNumber} S/N ${content.accumulator.serialNumber}.\n\nIt awaits independent inspection: ${link}\n\nThe approved maintenance data and local regulations govern.`,
  })))
  return worksheetAnswer(event, id)
})
