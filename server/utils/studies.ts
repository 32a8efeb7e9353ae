import { formatPressure, formatTemperature, formatVolume } from '../../shared/gas/format'
import type { StudyInput } from '../../shared/schemas/study'
import type { StudyResults } from '../../shared/utils/study'
import { SizingStudy, Specification } from '../models'
import { PdfWriter } from './pdf-writer'

export interface StudyDto {
  id: number
  name: string
  specificationId: number | null
  inputs: StudyInput
  results: StudyResults
  engineVersion: string
  createdAt: string
  updatedAt: string
}

export async function findStudy(id: number): Promise<SizingStudy> {
  const study = await SizingStudy.findByPk(id)
  if (!study) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Study not found.' })
  return study
}

export function toStudyDto(study: SizingStudy): StudyDto {
  return {
    id: study.id,
    name: study.name,
    specificationId: study.specificationId,
    inputs: study.inputs as unknown as StudyInput,
    results: study.results as unknown as StudyResults,
    engineVersion: study.engineVersion,
    createdAt: study.createdAt.toISOString(),
    updatedAt: study.updatedAt.toISOString(),
  }
}

/** A linked specification must exist. */
export async function requireSpecification(id: number | null): Promise<void> {
  if (id !== null && !(await Specification.findByPk(id))) {
    throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'The linked specification does not exist.', data: { field: 'specificationId', issues: [{ path: ['specificationId'], field: 'specificationId', message: 'No such specification.' }] } })
  }
}

const describe = (process: StudyInput['charge']) => typeof process === 'object' ? `polytropic n = ${process.n}` : process

export async function studyPdf(study: StudyDto): Promise<Uint8Array> {
  const pdf = await PdfWriter.create(`Chargewell sizing study ${study.id}`)
  const { inputs, results } = study
  pdf.write('Chargewell - accumulator sizing study', { bold: true, size: 16, gap: 4 })
  pdf.write(`${study.name} (study ${study.id}), engine version ${results.engineVersion}, computed ${study.updatedAt}`, { bold: true })
  pdf.heading('Inputs')
  pdf.write(`${inputs.accumulatorType} accumulator, gas volume ${formatVolume(inputs.gasVolume)}, pre-charge ${formatPressure(inputs.precharge)} at ${formatTemperature(inputs.prechargeTemperature)}.`)
  pdf.write(`Working pressures ${formatPressure(inputs.minPressure)} to ${formatPressure(inputs.maxPressure)}; charge ${describe(inputs.charge)}, discharge ${describe(inputs.discharge)}; ${inputs.model} gas.${inputs.perApplication ? ` Volume per application ${formatVolume(inputs.perApplication)}.` : ''}`)
  pdf.write(`Method: ${results.method}`)
  pdf.heading('Results by temperature')
  for (const row of results.rows) {
    pdf.write(`${row.label} - ${formatTemperature(row.temperature)}`, { bold: true })
    if (row.error) {
      pdf.write(`Not computed: ${row.error}`)
      continue
    }
    const result = row.result!
    pdf.write(`Pre-charge at temperature ${formatPressure(result.prechargeAtOperatingTemperature)}; gas volume ${formatVolume(result.gasVolumeAtMax)} at maximum, ${formatVolume(result.gasVolumeAtMin)} at minimum; usable ${formatVolume(result.usableVolume)}.`)
    if (result.applications !== undefined) pdf.write(`Applications: ${result.applications}, residual pressure ${formatPressure(result.residualPressure!)}.`)
    if (row.sweep) pdf.write(`Pre-charge for the most usable fluid: ${formatPressure(row.sweep.optimum.precharge)} (usable ${formatVolume(row.sweep.optimum.usableVolume)}).`)
    if (row.required) pdf.write(`Gas volume needed for the demand: ${formatVolume(row.required.gasVolume)}.`)
    for (const warning of result.warnings) pdf.write(`Warning: ${warning}`)
  }
  pdf.heading('Note')
  pdf.write('A sizing aid. The approved maintenance data, the maker\'s limits, the operator\'s procedures and local regulations govern.')
  return pdf.save()
}
