import { studyInputSchema } from '#shared/schemas/study'
import { computeStudy } from '#shared/utils/study'

/** POST /api/calc/study — a sizing study computed without saving it (every signed-in role). */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(studyInputSchema))
  return runEngine(() => computeStudy(body), 'precharge')
})
