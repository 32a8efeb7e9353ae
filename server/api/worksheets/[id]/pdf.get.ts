import { idParamsSchema } from '#shared/schemas/common'
import { worksheetRecordPdf } from '../../../services/worksheets'

/** A released (or voided) record as a PDF. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'worksheet.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return sendPdf(event, `worksheet-${id}`, await worksheetRecordPdf(id))
})
