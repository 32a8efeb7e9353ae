import { tableTargetSchema } from '#shared/schemas/calc'
import { chargeTargetFromTable } from '#shared/gas/charge-target'

/** POST /api/calc/table-target — the pre-charge interpolated in an approved-data table. */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'calculation.run')
  const body = await readValidatedBody(event, validateWith(tableTargetSchema))
  return runEngine(() => chargeTargetFromTable(body), 'gasTemperature')
})
