import { idParamsSchema } from '#shared/schemas/common'
import { removeAttachment } from '../../services/attachments'
import { versioned } from '../../services/worksheets'

/** Removes a photo or certificate from a worksheet the performer is still filling; answers the worksheet. */
export default defineEventHandler(async (event) => {
  const user = await requireAbility(event, 'worksheet.perform')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return versioned(event, await removeAttachment(user, id))
})
