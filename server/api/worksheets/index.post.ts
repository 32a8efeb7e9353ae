import { worksheetCreateSchema } from '#shared/schemas/worksheet'
import { startWorksheet, versioned } from '../../services/worksheets'

/**
 * Starts a worksheet for an installed accumulator, freezing the current specification into it.
 * With `correctsId`, the new worksheet is a correction of a released one and points at it.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const body = await readValidatedBody(event, validateWith(worksheetCreateSchema))
  setResponseStatus(event, 201)
  return versioned(event, await startWorksheet(user, body))
})
