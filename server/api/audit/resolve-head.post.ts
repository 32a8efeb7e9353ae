import { auditResolveHeadSchema } from '#shared/schemas/audit'
import { resolveHead } from '../../services/audit'

/** Re-seals the chain's head over the entries that are there, with the administrator's reason, so writes resume. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'audit.verify')
  const body = await readValidatedBody(event, validateWith(auditResolveHeadSchema))
  return resolveHead(user, body)
})
