import { idParamsSchema } from '#shared/schemas/common'
import { versioned, worksheetById } from '../../services/worksheets'

/** One worksheet: content, results, signatures, attachments; its version as the ETag. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'worksheet.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return versioned(event, await worksheetById(id, scope))
})
