import { idParamsSchema } from '../../../shared/schemas/auth'
import { removeAttachment } from '../../services/attachments'

/** Removes a photo or certificate from a worksheet the performer is still filling; answers the worksheet. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const worksheetId = await removeAttachment(user, id)
  return worksheetAnswer(event, worksheetId)
})
