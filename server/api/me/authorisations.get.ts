import { listAuthorisations } from '../../services/authorisations'

/** The signed-in user's certifying authorisations: what they may sign, and until when. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'account.own')
  return listAuthorisations({ holderId: user.id })
})
