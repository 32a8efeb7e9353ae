import { preferencesSchema } from '../../../shared/schemas/auth'

/** Saves the user's display units and home station. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const preferences = await readValidatedBody(event, validateWith(preferencesSchema))
  await writeTransaction(transaction => user.update({ preferences }, { transaction }))
  return user.toPublic()
})
