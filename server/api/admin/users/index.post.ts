import { userCreateSchema } from '../../../../shared/schemas/auth'
import { appendAudit } from '../../../database/audit-chain'
import { User } from '../../../models'
import { DEFAULT_PREFERENCES } from '../../../../shared/types/user'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const body = await readValidatedBody(event, validateWith(userCreateSchema))
  if (await User.findOne({ where: { email: body.email } })) {
    throw createError({ status: 409, message: `A user with the e-mail ${body.email} already exists.`, data: { issues: [{ path: ['email'], field: 'email', message: 'Already in use.' }] } })
  }
  const user = await writeTransaction(async (transaction) => {
    const created = await User.create({
      email: body.email, name: body.name, roles: body.roles, authorisationNumber: body.authorisationNumber ?? null,
      passwordHash: await hashPassword(body.password), preferences: DEFAULT_PREFERENCES,
    }, { transaction })
    await appendAudit({ actorId: admin.id, entity: 'user', entityId: String(created.id), action: 'created', detail: { email: created.email, roles: created.roles } }, transaction)
    return created
  })
  setResponseStatus(event, 201)
  return user.toPublic()
})
