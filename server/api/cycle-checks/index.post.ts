import { cycleCheckSchema } from '#shared/schemas/cycle-check'
import { recordCycleCheck } from '../../services/cycle-checks'

/** Logs a pump cycle check; the server works out the implied leak rate from the system accumulator. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'cycle-check.record')
  const body = await readValidatedBody(event, validateWith(cycleCheckSchema))
  const check = await recordCycleCheck(user, body)
  setResponseStatus(event, 201)
  return check
})
