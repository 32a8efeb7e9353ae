import { Op } from 'sequelize'
import { idParamsSchema } from '../../../../shared/schemas/auth'
import { signatureSchema } from '../../../../shared/schemas/worksheet'
import { PERFORMER_STATEMENT, type WorksheetContent, type WorksheetResults } from '../../../../shared/types/worksheet'
import { canEdit } from '../../../../shared/utils/worksheet-rules'
import { appendAudit } from '../../../database/audit-chain'
import { Signature, User } from '../../../models'

/** The performer signs (password re-entered): results are recomputed and frozen, and inspectors are told. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(signatureSchema))
  const worksheet = await findWorksheet(id)
  enforce(canEdit(user, worksheet))
  await confirmPassword(user, password)
  const content = worksheet.content as unknown as WorksheetContent
  const results: WorksheetResults = recomputeResults(content)
  const missing = missingForSignature(content, results)
  if (missing.length) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `Not ready to sign. Still needed: ${missing.join('; ')}.`, data: { missing } })
  const now = new Date()
  const sequelize = await useDB()
  await sequelize.transaction(async (transaction) => {
    await worksheet.update({ state: 'awaiting-countersign', results: results as Record<string, unknown>, engineVersion: ENGINE_VERSION, serviceable: results.asLeft!.assessment.verdict === 'in-limits', submittedAt: now, returnReason: null }, { transaction })
    await Signature.create({ worksheetId: worksheet.id, userId: user.id, capacity: 'performer', name: user.name, authorisationNumber: user.authorisationNumber, statement: PERFORMER_STATEMENT, signedAt: now }, { transaction })
    await appendAudit({ at: now, actorId: user.id, entity: 'worksheet', entityId: String(worksheet.id), action: 'signed', detail: { engineVersion: ENGINE_VERSION, serviceable: results.asLeft!.assessment.verdict === 'in-limits' } }, transaction)
  })
  const inspectors = (await User.findAll({ where: { disabled: false, id: { [Op.ne]: user.id } } })).filter(candidate => candidate.roles.includes('inspector'))
  const link = `${useRuntimeConfig().publicUrl}/worksheets/${worksheet.id}`
  await Promise.all(inspectors.map(inspector => sendMail({
    to: inspector.email,
    kind: 'awaiting-countersign',
    worksheetId: worksheet.id,
    subject: `Worksheet ${worksheet.id} awaits countersign — ${content.aircraft.registration}, ${content.accumulator.position}`,
    text: `${user.name} signed worksheet ${worksheet.id} (work order ${worksheet.workOrder}) for ${content.aircraft.registration}, ${content.accumulator.position}, P/N ${content.accumulator.partNumber} S/N ${content.accumulator.serialNumber}.\n\nIt awaits independent inspection: ${link}\n\nThe approved maintenance data and local regulations govern.`,
  })))
  return toWorksheetDto(await findWorksheet(id))
})
