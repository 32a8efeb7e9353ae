import { accumulatorSchema } from '#shared/schemas/accumulators'
import { registerUnit } from '../../services/accumulators'

/** Registers an accumulator, installed on an aircraft or in stores. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'fleet.manage')
  const body = await readValidatedBody(event, validateWith(accumulatorSchema))
  setResponseStatus(event, 201)
  return registerUnit(user, body)
})
