import { forecastSettledPressure } from '#shared/gas/settle'
import { settleForecastSchema } from '#shared/schemas/calc'

/**
 * POST /api/calc/settle-forecast — where a gauge reading is heading while the gas settles (advice; the settle
 * time rules).
 */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(settleForecastSchema))
  return runEngine(() => forecastSettledPressure(body), 'readings')
})
