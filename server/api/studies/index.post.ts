import { studyInputSchema } from '../../../shared/schemas/study'
import { computeStudy } from '../../../shared/utils/study'
import { appendAudit } from '../../database/audit-chain'
import { SizingStudy } from '../../models'

/** Saves a new study; the server computes its results and freezes them with the engine version. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer', 'admin')
  const inputs = await readValidatedBody(event, validateWith(studyInputSchema))
  await requireSpecification(inputs.specificationId)
  const results = runEngine(() => computeStudy(inputs))
  const study = await writeTransaction(async (transaction) => {
    const created = await SizingStudy.create({ name: inputs.name, specificationId: inputs.specificationId, inputs, results: results as unknown as Record<string, unknown>, engineVersion: results.engineVersion, createdById: user.id, updatedById: user.id }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'study', entityId: String(created.id), action: 'created', detail: { name: inputs.name } }, transaction)
    return created
  })
  setResponseStatus(event, 201)
  return toStudyDto(study)
})
