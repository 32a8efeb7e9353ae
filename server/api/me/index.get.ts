import { noQuerySchema } from '#shared/schemas/common'

/** The signed-in user, with roles and unit preferences as stored. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return user.toPublic()
})
