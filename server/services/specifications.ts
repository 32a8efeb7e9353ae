import type { H3Event } from 'h3'
import type { Transaction } from 'sequelize'
import type { z } from 'zod'
import type {
  SpecificationBody,
  specificationQuerySchema,
  specificationUpdateSchema,
} from '#shared/schemas/specifications'
import { specificationCsvRow } from '#shared/schemas/csv'
import { SPECIFICATION_LOCAL_FIELDS, specificationSchema } from '#shared/schemas/specifications'
import type { SpecificationDto } from '#shared/types/registers'
import { appendAudit } from '../database/audit-chain'
import { currentSpecification } from '../database/current-specification'
import { Specification, SpecificationTablePoint, type User } from '../models'
import { findOr404, unprocessable } from './audited-writes'
import { specificationChanged } from '../utils/domain-events'

/**
 * Servicing specifications: one current revision per part number. A change to the approved-data
 * figures is a new revision that supersedes the old (worksheets keep the revision they froze);
 * title, check interval and loss threshold change in place.
 */

export { currentSpecification }

const WITH_POINTS = { include: [{ model: SpecificationTablePoint, as: 'tablePoints' }] }

export function toSpecificationDto(specification: Specification): SpecificationDto {
  const {
    createdAt: _created,
    updatedAt: _updated,
    supersedesId: _supersedes,
    tablePoints,
    ...fields
  } = specification.get({ plain: true }) as Specification
  const points = (tablePoints ?? []).map(point => ({
    temperature: point.temperature,
    temperatureUnit: point.temperatureUnit,
    pressure: point.pressure,
  }))
  return { ...fields, tablePoints: points.sort((a, b) => a.temperature - b.temperature) }
}

export async function listSpecifications(query: z.infer<typeof specificationQuerySchema>) {
  const { total, totalCapped, rows } = await pageOf(Specification, {
    where: {
      ...searchWhere(query.q, ['partNumber', 'title', 'dataReference']),
      ...(query.status === 'all' ? {} : { status: query.status }),
      ...(query.accumulatorType ? { accumulatorType: query.accumulatorType } : {}),
    },
    ...WITH_POINTS,
    order: [
      [query.sort, query.direction.toUpperCase()],
      ['revision', 'DESC'],
    ],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, totalCapped, items: rows.map(toSpecificationDto) }
}

export async function specificationById(id: number): Promise<SpecificationDto> {
  return toSpecificationDto(await findOr404(Specification, id, 'Specification', WITH_POINTS))
}

/**
 * Writes a revision with its table points (inside the caller's transaction), marks the revision
 * it supersedes, and audits both.
 */
export async function createRevision(
  body: SpecificationBody,
  supersedesId: number | null,
  actorId: number | null,
  transaction: Transaction,
) {
  const { tablePoints, ...fields } = body
  const audit = (id: number, action: string, detail: object) =>
    appendAudit({ actorId, entity: 'specification', entityId: String(id), action, detail: { ...detail } }, transaction)
  if (supersedesId) {
    await Specification.update({ status: 'superseded' }, { where: { id: supersedesId }, transaction })
    await audit(supersedesId, 'superseded', { by: fields.revision })
  }
  const created = await Specification.create({ ...fields, status: 'current', supersedesId }, { transaction })
  for (const point of tablePoints)
    await SpecificationTablePoint.create({ ...point, specificationId: created.id }, { transaction })
  await audit(created.id, supersedesId ? 'revised' : 'created', {
    partNumber: fields.partNumber,
    revision: fields.revision,
    supersedesId,
  })
  return toSpecificationDto((await Specification.findByPk(created.id, { ...WITH_POINTS, transaction }))!)
}

/** A specification for a part number not yet in the register. */
export async function createSpecification(actor: User, body: SpecificationBody): Promise<SpecificationDto> {
  const current = await currentSpecification(body.partNumber)
  if (current) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      data: { field: 'partNumber' },
      message: `P/N ${body.partNumber} already has a current specification (rev ${current.revision}); issue a new revision of it instead.`,
    })
  }
  const conflict = 'That part number and revision already exist.'
  const created = await uniqueOr409(
    () => writeTransaction(transaction => createRevision(body, null, actor.id, transaction)),
    conflict,
  )
  await specificationChanged(body.partNumber)
  return created
}

/** A change in place (title, check interval, loss threshold), or a new revision; `revised` says which. */
export async function changeSpecification(actor: User, id: number, changes: z.infer<typeof specificationUpdateSchema>) {
  const specification = await findOr404(Specification, id, 'Specification', WITH_POINTS)
  if (specification.status !== 'current') {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: `Rev ${specification.revision} is superseded; change the current revision instead.`,
    })
  }
  const local = Object.keys(changes).every(key => (SPECIFICATION_LOCAL_FIELDS as readonly string[]).includes(key))
  if (local) {
    await writeTransaction(async (transaction) => {
      await specification.update(changes, { transaction })
      await appendAudit(
        { actorId: actor.id, entity: 'specification', entityId: String(id), action: 'updated', detail: changes },
        transaction,
      )
    })
    // A new threshold or check interval changes which units are flagged.
    await specificationChanged(specification.partNumber)
    return { revised: false, specification: toSpecificationDto(specification) }
  }
  if (!changes.revision || changes.revision === specification.revision) {
    unprocessable(
      'A change to the approved-data figures is a new revision: give the new revision letter or number.',
      'revision',
    )
  }
  const { id: _id, status: _status, ...currentFields } = toSpecificationDto(specification)
  const next = parseInput(specificationSchema, { ...currentFields, ...changes })
  const created = await uniqueOr409(
    () => writeTransaction(transaction => createRevision(next, specification.id, actor.id, transaction)),
    'That revision already exists for this part number.',
  )
  await specificationChanged(specification.partNumber)
  return { revised: true, specification: created }
}

/**
 * From CSV: a new part number is added; a new revision supersedes its current one; a revision already in the
 * register imports back unchanged when its row is the export's, and is refused when a cell differs (an issued
 * revision never changes: its worksheets froze it). Every row valid, or nothing imported.
 */
/** The cells of an imported row that differ from an issued revision (numbers by value, table points as written). */
function differingCells(issued: SpecificationDto, row: Record<string, unknown>): string[] {
  const cell = (value: unknown) =>
    (value === null || value === undefined ? '' : typeof value === 'number' ? String(Number(value)) : String(value))
  const points = (list: { temperature: number, temperatureUnit: string, pressure: number }[]) =>
    list.map(point => `${Number(point.temperature)} ${point.temperatureUnit} ${Number(point.pressure)}`).join('; ')
  return Object.keys(row).filter((field) => {
    if (field === 'status') return false
    if (field === 'tablePoints') return points(issued.tablePoints) !== points((row.tablePoints ?? []) as typeof issued.tablePoints)
    return cell((issued as unknown as Record<string, unknown>)[field]) !== cell(row[field])
  })
}

export async function importSpecifications(event: H3Event, actor: User) {
  const partNumbers = new Set<string>()
  const report = await importCsv(
    event,
    specificationCsvRow,
    async (row, transaction) => {
      const key = `${row.partNumber} rev ${row.revision}`
      const where = { partNumber: row.partNumber, revision: row.revision }
      const same = await Specification.findOne({ where, transaction })
      if (same) return { key, action: 'unchanged' as const }
      partNumbers.add(row.partNumber)
      const current = await currentSpecification(row.partNumber, transaction)
      await createRevision(row, current?.id ?? null, actor.id, transaction)
      return { key, action: 'added' as const }
    },
    async (row, line) => {
      const where = { partNumber: row.partNumber, revision: row.revision }
      const same = await Specification.findOne({ where, ...WITH_POINTS })
      if (!same) return []
      const differs = differingCells(toSpecificationDto(same), row)
      return differs.map(field => ({
        line,
        field,
        message: `P/N ${row.partNumber} rev ${row.revision} is issued and does not change: `
          + 'import the edit as a new revision.',
      }))
    },
  )
  for (const partNumber of partNumbers) await specificationChanged(partNumber)
  return report
}
