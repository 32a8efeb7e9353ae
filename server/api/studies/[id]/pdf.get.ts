import { idParamsSchema } from '#shared/schemas/common'
import { studyPdf } from '../../../services/studies'

/** The study as a PDF report: inputs, results per temperature, warnings, method and engine version. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'study.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return sendPdf(event, `study-${id}`, await studyPdf(id))
})
