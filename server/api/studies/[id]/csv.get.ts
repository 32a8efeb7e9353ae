import { idParamsSchema } from '#shared/schemas/common'
import { studyCsv } from '../../../services/studies'

/** The study's results per temperature as CSV: figures as numbers, each unit in its own column. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'study.read')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  return studyCsv(event, id)
})
