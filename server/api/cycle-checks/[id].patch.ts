import { idParamsSchema } from '#shared/schemas/common'
import { cycleCheckCorrectionSchema } from '#shared/schemas/cycle-check'
import { correctCycleCheck } from '../../services/cycle-checks'

/** Corrects a check's figures (by the one who recorded it, or an engineer); the leak rate is recomputed. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'cycle-check.record')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(cycleCheckCorrectionSchema))
  const check = await correctCycleCheck(user, id, body, expectedVersion(event))
  setVersionTag(event, check.version)
  return check
})
