import { worksheetListQuerySchema } from '../../../shared/schemas/worksheet'
import { listWorksheets } from '../../services/worksheet-list'

/** Worksheets with filters, prefix search, sort and cursor pages; every signed-in role may read them. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(worksheetListQuerySchema))
  return listWorksheets(query)
})
