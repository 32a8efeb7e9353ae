import { scopeDto } from '../../services/scope'

/** What the signed-in user may see: their stations and operators. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  return scopeDto(user)
})
