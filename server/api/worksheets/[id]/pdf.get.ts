import { idParamsSchema } from '#shared/schemas/common'
import { worksheetRecordPdf } from '../../../services/record-export'

/** A released (or voided) record as a PDF that verifies on its own (content, assertions and keys embedded). */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'worksheet.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return sendPdf(event, `worksheet-${id}`, await worksheetRecordPdf(event, id, scope))
})
