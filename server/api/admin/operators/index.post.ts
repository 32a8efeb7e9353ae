import { operatorSchema } from '#shared/schemas/organisation'
import { createOperator } from '../../../services/organisation'

/** Adds an operator (audited). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'fleet.manage')
  const body = await readValidatedBody(event, validateWith(operatorSchema))
  setResponseStatus(event, 201)
  return createOperator(admin, body)
})
