import { idParamsSchema } from '../../../shared/schemas/auth'
import { studyInputSchema } from '../../../shared/schemas/study'
import { computeStudy } from '../../../shared/utils/study'
import { appendAudit } from '../../database/audit-chain'

/** Replaces a study's inputs and recomputes its results. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer', 'admin')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const inputs = await readValidatedBody(event, validateWith(studyInputSchema))
  const study = await findStudy(id)
  await requireSpecification(inputs.specificationId)
  const results = runEngine(() => computeStudy(inputs))
  await writeTransaction(async (transaction) => {
    await study.update({ name: inputs.name, specificationId: inputs.specificationId, inputs, results: results as unknown as Record<string, unknown>, engineVersion: results.engineVersion, updatedById: user.id }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'study', entityId: String(study.id), action: 'updated', detail: { name: inputs.name } }, transaction)
  })
  return toStudyDto(study)
})
