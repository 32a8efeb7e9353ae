import { offlineWorksheetSchema } from '#shared/schemas/worksheet'
import { syncOfflineWorksheet } from '../../services/device-sync'

/**
 * A worksheet filled on a device with no signal, sent whole: started once (by the device's id),
 * every step replayed at its time and recomputed, and what could not be accepted reported.
 */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const body = await readValidatedBody(event, validateWith(offlineWorksheetSchema))
  const answer = await syncOfflineWorksheet(user, body)
  setResponseStatus(event, answer.created ? 201 : 200)
  return answer
})
