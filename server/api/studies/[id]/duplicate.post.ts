import { idParamsSchema } from '../../../../shared/schemas/auth'
import { appendAudit } from '../../../database/audit-chain'
import { SizingStudy } from '../../../models'

/** A copy of a study to vary, named "(copy)". */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer', 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const original = await findStudy(id)
  const name = `${original.name} (copy)`.slice(0, 160)
  const copy = await writeTransaction(async (transaction) => {
    const created = await SizingStudy.create({
      name, specificationId: original.specificationId, inputs: { ...original.inputs, name }, results: original.results,
      engineVersion: original.engineVersion, createdById: user.id, updatedById: user.id,
    }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'study', entityId: String(created.id), action: 'duplicated', detail: { from: original.id } }, transaction)
    return created
  })
  setResponseStatus(event, 201)
  return toStudyDto(copy)
})
