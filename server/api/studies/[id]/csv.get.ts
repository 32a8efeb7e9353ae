import { idParamsSchema } from '../../../../shared/schemas/auth'
import type { StudyResults } from '../../../../shared/utils/study'

const round = (value: number | undefined, digits: number) => value === undefined ? '' : Number(value.toFixed(digits))

const COLUMNS = [
  'Condition', 'Temperature', 'Temperature unit', 'Pre-charge at temperature', 'Pressure unit', 'Pressure basis', 'Gas volume at max',
  'Gas volume at min', 'Usable volume', 'Volume unit', 'Applications', 'Residual pressure', 'Optimum pre-charge', 'Required gas volume',
  'Warnings', 'Engine version',
]

/** The study's results per temperature as CSV: figures as numbers, each unit in its own column. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const study = await findStudy(id)
  const results = study.results as unknown as StudyResults
  const rows = results.rows.map(row => [
    row.label,
    row.temperature.value,
    row.temperature.unit,
    round(row.result?.prechargeAtOperatingTemperature.value, 1),
    row.result?.prechargeAtOperatingTemperature.unit ?? '',
    row.result?.prechargeAtOperatingTemperature.basis ?? '',
    round(row.result?.gasVolumeAtMax.value, 3),
    round(row.result?.gasVolumeAtMin.value, 3),
    round(row.result?.usableVolume.value, 3),
    row.result?.usableVolume.unit ?? '',
    row.result?.applications ?? '',
    round(row.result?.residualPressure?.value, 1),
    round(row.sweep?.optimum.precharge.value, 1),
    round(row.required?.gasVolume.value, 3),
    [...(row.result?.warnings ?? []), ...(row.error ? [row.error] : [])].join(' | '),
    results.engineVersion,
  ])
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-study-${study.id}.csv"`)
  return csvText(COLUMNS, rows)
})
