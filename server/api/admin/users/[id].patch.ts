import { userUpdateSchema } from '#shared/schemas/auth'
import { idParamsSchema } from '#shared/schemas/common'
import { updateUser } from '../../../services/users'

/** Name, roles, authorisation number, enable/disable. An admin cannot lock themselves out. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(userUpdateSchema))
  return (await updateUser(admin, id, body)).toPublic()
})
