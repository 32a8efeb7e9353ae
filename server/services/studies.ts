import type { H3Event } from 'h3'
import { Op } from 'sequelize'
import type { z } from 'zod'
import { formatPressure, formatTemperature, formatVolume } from '#shared/gas/format'
import type { StudyInput, studyListQuerySchema } from '#shared/schemas/study'
import type { StudyDto, StudyListItem } from '#shared/types/study'
import { computeStudy } from '#shared/utils/study'
import { appendAudit } from '../database/audit-chain'
import { SizingStudy, Specification, User } from '../models'
import { findOr404, unprocessable } from './audited-writes'

/**
 * Sizing studies: the server computes the results from the inputs with the engine and freezes
 * them with its version; a study can be listed, reopened, changed, duplicated, and read as CSV
 * or as a PDF report.
 */

export function toStudyDto(study: SizingStudy): StudyDto {
  return {
    id: study.id,
    name: study.name,
    specificationId: study.specificationId,
    inputs: study.inputs,
    results: study.results,
    engineVersion: study.engineVersion,
    createdAt: study.createdAt.toISOString(),
    updatedAt: study.updatedAt.toISOString(),
  }
}

const findStudy = (id: number) => findOr404(SizingStudy, id, 'Study')

/** A linked specification must exist. */
async function requireSpecification(id: number | null): Promise<void> {
  if (id !== null && !(await Specification.findByPk(id)))
    unprocessable('The linked specification does not exist.', 'specificationId')
}

/** The fields a study stores for these inputs, results computed here. */
async function computed(inputs: StudyInput) {
  await requireSpecification(inputs.specificationId)
  const results = runEngine(() => computeStudy(inputs))
  return {
    name: inputs.name,
    specificationId: inputs.specificationId,
    inputs,
    results,
    engineVersion: results.engineVersion,
  }
}

export async function listStudies(
  query: z.infer<typeof studyListQuerySchema>,
): Promise<{ total: number, items: StudyListItem[] }> {
  const { rows, count } = await SizingStudy.findAndCountAll({
    where: {
      ...(query.q ? { name: { [likeOperator()]: `%${query.q}%` } } : {}),
      ...(query.specificationId ? { specificationId: query.specificationId } : {}),
    },
    attributes: ['id', 'name', 'specificationId', 'engineVersion', 'updatedAt', 'createdById'],
    include: [{ model: Specification, as: 'specification', attributes: ['partNumber', 'revision'] }],
    order: [
      ['updatedAt', 'DESC'],
      ['id', 'DESC'],
    ],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  })
  const authors = await User.findAll({
    where: { id: { [Op.in]: [...new Set(rows.map(row => row.createdById))] } },
    attributes: ['id', 'name'],
  })
  const authorOf = new Map(authors.map(user => [user.id, user.name]))
  return {
    total: count,
    items: rows.map(study => ({
      id: study.id,
      name: study.name,
      engineVersion: study.engineVersion,
      updatedAt: study.updatedAt.toISOString(),
      author: authorOf.get(study.createdById) ?? '',
      specification: study.specification
        ? `${study.specification.partNumber} rev ${study.specification.revision}`
        : null,
    })),
  }
}

export async function studyById(id: number): Promise<StudyDto> {
  return toStudyDto(await findStudy(id))
}

export async function createStudy(actor: User, inputs: StudyInput): Promise<StudyDto> {
  const fields = await computed(inputs)
  return toStudyDto(
    await writeTransaction(async (transaction) => {
      const created = await SizingStudy.create(
        { ...fields, createdById: actor.id, updatedById: actor.id },
        { transaction },
      )
      await appendAudit(
        {
          actorId: actor.id,
          entity: 'study',
          entityId: String(created.id),
          action: 'created',
          detail: { name: inputs.name },
        },
        transaction,
      )
      return created
    }),
  )
}

/** Replaces a study's inputs and recomputes its results. */
export async function updateStudy(actor: User, id: number, inputs: StudyInput): Promise<StudyDto> {
  const study = await findStudy(id)
  const fields = await computed(inputs)
  await writeTransaction(async (transaction) => {
    await study.update({ ...fields, updatedById: actor.id }, { transaction })
    await appendAudit(
      { actorId: actor.id, entity: 'study', entityId: String(id), action: 'updated', detail: { name: inputs.name } },
      transaction,
    )
  })
  return toStudyDto(study)
}

/** A copy of a study to vary, named "(copy)". */
export async function duplicateStudy(actor: User, id: number): Promise<StudyDto> {
  const original = await findStudy(id)
  const name = `${original.name} (copy)`.slice(0, 160)
  return toStudyDto(
    await writeTransaction(async (transaction) => {
      const created = await SizingStudy.create(
        {
          name,
          specificationId: original.specificationId,
          inputs: { ...original.inputs, name },
          results: original.results,
          engineVersion: original.engineVersion,
          createdById: actor.id,
          updatedById: actor.id,
        },
        { transaction },
      )
      await appendAudit(
        {
          actorId: actor.id,
          entity: 'study',
          entityId: String(created.id),
          action: 'duplicated',
          detail: { from: original.id },
        },
        transaction,
      )
      return created
    }),
  )
}

const round = (value: number | undefined, digits: number) => (value === undefined ? '' : Number(value.toFixed(digits)))
const CSV_COLUMNS = [
  'Condition',
  'Temperature',
  'Temperature unit',
  'Pre-charge at temperature',
  'Pressure unit',
  'Pressure basis',
  'Gas volume at max',
  'Gas volume at min',
  'Usable volume',
  'Volume unit',
  'Applications',
  'Residual pressure',
  'Optimum pre-charge',
  'Required gas volume',
  'Warnings',
  'Engine version',
]

/** The study's results per temperature as CSV: figures as numbers, each unit in its own column. */
export async function studyCsv(event: H3Event, id: number): Promise<string> {
  const { results } = await findStudy(id)
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
  return sendCsv(
    event,
    `study-${id}`,
    rows.map(row => Object.fromEntries(CSV_COLUMNS.map((column, index) => [column, row[index]]))),
    CSV_COLUMNS,
  )
}

const describeProcess = (process: StudyInput['charge']) =>
  typeof process === 'object' ? `polytropic n = ${process.n}` : process

/** The study as a PDF report: inputs, results per temperature, warnings, method and engine version. */
export async function studyPdf(id: number): Promise<Uint8Array> {
  const study = toStudyDto(await findStudy(id))
  const display = displayFormatOfStation()
  const pdf = await PdfWriter.create(`Chargewell sizing study ${study.id}`)
  const { inputs, results } = study
  pdf.write('Chargewell — accumulator sizing study', { bold: true, size: 16, gap: 4 })
  pdf.write(
    `${study.name} (study ${study.id}), engine version ${results.engineVersion}, computed ${display.dateTime(study.updatedAt)}`,
    { bold: true },
  )
  pdf.heading('Inputs')
  pdf.write(
    `${inputs.accumulatorType} accumulator, gas volume ${formatVolume(inputs.gasVolume)}, pre-charge ${formatPressure(inputs.precharge)} at ${formatTemperature(inputs.prechargeTemperature)}.`,
  )
  pdf.write(
    `Working pressures ${formatPressure(inputs.minPressure)} to ${formatPressure(inputs.maxPressure)}; charge ${describeProcess(inputs.charge)}, discharge ${describeProcess(inputs.discharge)}; ${inputs.model} gas.`
    + (inputs.perApplication ? ` Volume per application ${formatVolume(inputs.perApplication)}.` : ''),
  )
  if (results.verdict)
    pdf.write(results.verdict.message, { bold: true, colour: results.verdict.meets ? undefined : [0.55, 0.1, 0.07] })
  pdf.write(`Method: ${results.method}`)
  pdf.heading('Results by temperature')
  for (const row of results.rows) {
    pdf.write(`${row.label} — ${formatTemperature(row.temperature)}`, { bold: true })
    if (row.error || !row.result) {
      pdf.write(`Not computed: ${row.error ?? 'no result'}`)
      continue
    }
    const result = row.result
    pdf.write(
      `Pre-charge at temperature ${formatPressure(result.prechargeAtOperatingTemperature)}; gas volume ${formatVolume(result.gasVolumeAtMax)} at maximum, `
      + `${formatVolume(result.gasVolumeAtMin)} at minimum; usable ${formatVolume(result.usableVolume)}.`,
    )
    if (result.applications !== undefined)
      pdf.write(`Applications: ${result.applications}, residual pressure ${formatPressure(result.residualPressure!)}.`)
    if (row.sweep)
      pdf.write(
        `Pre-charge for the most usable fluid: ${formatPressure(row.sweep.optimum.precharge)} (usable ${formatVolume(row.sweep.optimum.usableVolume)}).`,
      )
    if (row.required) pdf.write(`Gas volume needed for the demand: ${formatVolume(row.required.gasVolume)}.`)
    for (const warning of result.warnings) pdf.write(`Warning: ${warning}`)
  }
  pdf.heading('Note')
  pdf.write(
    'A sizing aid. The approved maintenance data, the maker\'s limits, the operator\'s procedures and local regulations govern.',
  )
  return pdf.save()
}
