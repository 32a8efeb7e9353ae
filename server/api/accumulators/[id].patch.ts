import { accumulatorUpdateSchema } from '#shared/schemas/accumulators'
import { idParamsSchema } from '#shared/schemas/common'
import { changeUnit } from '../../services/accumulators'

/** Corrects an accumulator's identity, or moves it (off its aircraft, or onto another) keeping its history. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'fleet.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(accumulatorUpdateSchema))
  return changeUnit(user, id, body)
})
