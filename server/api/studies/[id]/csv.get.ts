import Papa from 'papaparse'
import { idParamsSchema } from '../../../../shared/schemas/auth'
import type { StudyResults } from '../../../../shared/utils/study'

/** The study's results per temperature as CSV. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const study = await findStudy(id)
  const results = study.results as unknown as StudyResults
  const csv = Papa.unparse(results.rows.map(row => ({
    'Condition': row.label,
    'Temperature': `${row.temperature.value} ${row.temperature.unit}`,
    'Pre-charge at temperature': row.result ? `${row.result.prechargeAtOperatingTemperature.value.toFixed(1)} ${row.result.prechargeAtOperatingTemperature.unit} ${row.result.prechargeAtOperatingTemperature.basis}` : '',
    'Gas volume at max': row.result?.gasVolumeAtMax.value.toFixed(3) ?? '',
    'Gas volume at min': row.result?.gasVolumeAtMin.value.toFixed(3) ?? '',
    'Usable volume': row.result?.usableVolume.value.toFixed(3) ?? '',
    'Volume unit': row.result?.usableVolume.unit ?? '',
    'Applications': row.result?.applications ?? '',
    'Residual pressure': row.result?.residualPressure ? row.result.residualPressure.value.toFixed(1) : '',
    'Optimum pre-charge': row.sweep ? row.sweep.optimum.precharge.value.toFixed(1) : '',
    'Required gas volume': row.required ? row.required.gasVolume.value.toFixed(3) : '',
    'Warnings': [...(row.result?.warnings ?? []), ...(row.error ? [row.error] : [])].join(' | '),
    'Engine version': results.engineVersion,
  })))
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-study-${study.id}.csv"`)
  return csv
})
