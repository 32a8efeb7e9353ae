import { preferencesSchema } from '../../../shared/schemas/auth'
import { sessionsChangedAfterCommit } from '../../services/sessions'

/** Saves the user's display units and home station. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const preferences = await readValidatedBody(event, validateWith(preferencesSchema))
  await writeTransaction(async (transaction) => {
    await user.update({ preferences }, { transaction })
    sessionsChangedAfterCommit(user.id, transaction)
  })
  return user.toPublic()
})
