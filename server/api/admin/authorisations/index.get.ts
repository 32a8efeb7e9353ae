import { listAuthorisations } from '../../../services/authorisations'

/** The register of certifying authorisations, each with its standing today at the station. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'user.manage')
  return listAuthorisations()
})
