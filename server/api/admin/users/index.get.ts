import { noQuerySchema } from '#shared/schemas/common'
import { listUsers } from '../../../services/users'

/** Every user with roles and authorisation number (never a password hash). */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'user.manage')
  await getValidatedQuery(event, validateWith(noQuerySchema))
  return listUsers()
})
