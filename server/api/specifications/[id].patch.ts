import { idParamsSchema } from '../../../shared/schemas/auth'
import { SPECIFICATION_LOCAL_FIELDS, specificationSchema, specificationUpdateSchema } from '../../../shared/schemas/registers'
import { appendAudit } from '../../database/audit-chain'
import { Specification, SpecificationTablePoint } from '../../models'
import { trendAfterSpecificationChange } from '../../services/trends'

/**
 * Title, check interval and loss threshold change in place. Any change to the approved-data
 * figures is a new revision (give `revision`): it supersedes this one, and the worksheets
 * that used this revision keep it.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const changes = await readValidatedBody(event, validateWith(specificationUpdateSchema))
  const specification = await Specification.findByPk(id, { include: [{ model: SpecificationTablePoint, as: 'tablePoints' }] })
  if (!specification) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Specification not found.' })
  if (specification.status !== 'current') throw createError({ status: 409, statusMessage: 'Conflict', message: `Rev ${specification.revision} is superseded; change the current revision instead.` })
  const local = Object.keys(changes).every(key => (SPECIFICATION_LOCAL_FIELDS as readonly string[]).includes(key))
  if (local) {
    await writeTransaction(async (transaction) => {
      await specification.update(changes, { transaction })
      await appendAudit({ actorId: user.id, entity: 'specification', entityId: String(id), action: 'updated', detail: changes }, transaction)
    })
    // A new threshold or check interval changes which units are flagged.
    await trendAfterSpecificationChange(specification.partNumber)
    return toSpecificationDto(specification)
  }
  if (!changes.revision || changes.revision === specification.revision) {
    throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'A change to the approved-data figures is a new revision: give the new revision letter or number.', data: { field: 'revision', issues: [{ path: ['revision'], field: 'revision', message: 'Give the new revision.' }] } })
  }
  const { id: _id, status: _status, ...currentFields } = toSpecificationDto(specification)
  const next = parseInput(specificationSchema, { ...currentFields, ...changes })
  const created = await uniqueOr409(() => writeTransaction(transaction => createRevision(next, specification.id, user.id, transaction)), 'That revision already exists for this part number.')
  await trendAfterSpecificationChange(specification.partNumber)
  setResponseStatus(event, 201)
  return created
})
