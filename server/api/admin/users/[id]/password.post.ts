import { passwordResetSchema } from '#shared/schemas/auth'
import { idParamsSchema } from '#shared/schemas/common'
import { resetPassword } from '../../../../services/users'

/** Sets a new password for a user (the admin hands it over; the user should change it); their sessions end. */
export default defineEventHandler(async (event) => {
  const admin = await requireAbility(event, 'user.manage')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { password } = await readValidatedBody(event, validateWith(passwordResetSchema))
  await resetPassword(admin, id, password)
  return { reset: true }
})
