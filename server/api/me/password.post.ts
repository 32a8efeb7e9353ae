import { passwordChangeSchema } from '#shared/schemas/auth'
import { changeOwnPassword } from '../../services/users'

/** Changes the user's own password (the current one re-entered); their other sessions end, this one stays. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  const body = await readValidatedBody(event, validateWith(passwordChangeSchema))
  await changeOwnPassword(user, body, event)
  return { changed: true }
})
