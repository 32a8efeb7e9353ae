import { idParamsSchema } from '#shared/schemas/common'
import { cycleCheckWithdrawSchema } from '#shared/schemas/cycle-check'
import { withdrawCycleCheck } from '../../../services/cycle-checks'

/** Withdraws a check with a reason: kept, and left out of the system's trend. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'cycle-check.record')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { reason } = await readValidatedBody(event, validateWith(cycleCheckWithdrawSchema))
  const check = await withdrawCycleCheck(user, id, reason, expectedVersion(event))
  setVersionTag(event, check.version)
  return check
})
