import { worksheetExportQuerySchema } from '#shared/schemas/worksheet'
import { exportWorksheets } from '../../services/exports'

/** Every worksheet the filters match, as CSV, streamed a thousand rows at a time: any size, constant memory. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'worksheet.read')
  const query = await getValidatedQuery(event, validateWith(worksheetExportQuerySchema))
  return exportWorksheets(event, query, scope)
})
