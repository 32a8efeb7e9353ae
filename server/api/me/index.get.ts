/** The signed-in user, with roles and unit preferences as stored. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  return user.toPublic()
})
