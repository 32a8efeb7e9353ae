import { worksheetCreateSchema } from '../../../shared/schemas/worksheet'
import { startWorksheet } from '../../services/worksheets'

/**
 * Starts a worksheet for an installed accumulator, freezing the current specification into it.
 * With `correctsId`, the new worksheet is a correction of a released one and points at it.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician')
  const body = await readValidatedBody(event, validateWith(worksheetCreateSchema))
  const id = await startWorksheet(user, body)
  setResponseStatus(event, 201)
  return worksheetAnswer(event, id)
})
