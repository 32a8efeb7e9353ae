import { worksheetListQuerySchema } from '#shared/schemas/worksheet'
import { listWorksheets } from '../../services/worksheet-list'

/** Worksheets with filters, prefix search, sort and cursor pages. */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'worksheet.read')
  const query = await getValidatedQuery(event, validateWith(worksheetListQuerySchema))
  return listWorksheets(query, scope)
})
