import { specificationSchema } from '../../../shared/schemas/registers'
import { Specification } from '../../models'
import { trendAfterSpecificationChange } from '../../services/trends'

/** A specification for a part number not yet in the register (engineers). */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer')
  const body = await readValidatedBody(event, validateWith(specificationSchema))
  const current = await Specification.findOne({ where: { partNumber: body.partNumber, status: 'current' } })
  if (current) throw createError({ status: 409, statusMessage: 'Conflict', message: `P/N ${body.partNumber} already has a current specification (rev ${current.revision}); issue a new revision of it instead.`, data: { field: 'partNumber' } })
  const created = await uniqueOr409(() => writeTransaction(transaction => createRevision(body, null, user.id, transaction)), 'That part number and revision already exist.')
  await trendAfterSpecificationChange(body.partNumber)
  setResponseStatus(event, 201)
  return created
})
