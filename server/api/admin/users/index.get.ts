import { User } from '../../../models'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  const users = await User.findAll({ order: [['name', 'ASC']] })
  return users.map(user => user.toPublic())
})
