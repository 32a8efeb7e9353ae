import { userCreateSchema } from '#shared/schemas/auth'
import { createUser } from '../../../services/users'

/** A new user with roles and a first password (the admin hands it over). */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const body = await readValidatedBody(event, validateWith(userCreateSchema))
  const user = await createUser(admin, body)
  setResponseStatus(event, 201)
  return user.toPublic()
})
