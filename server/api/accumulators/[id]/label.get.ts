import { idParamsSchema } from '#shared/schemas/common'
import { unitLabelCode } from '../../../services/accumulators'

/**
 * The QR code printed on a unit's label (SVG): scanned, it opens the unit's page at the configured public
 * address (or the one this request came to); never one only the server's machine can reach, in production.
 */
export default defineEventHandler(async (event) => {
  const { scope } = await requireScope(event, 'register.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const svg = await unitLabelCode(id, labelAddress(event), scope)
  setResponseHeader(event, 'content-type', 'image/svg+xml; charset=utf-8')
  setResponseHeader(event, 'cache-control', 'private, max-age=3600')
  return svg
})
