import type { InstalledUnitDto } from '#shared/types/fleet'
import type { SpecificationDto, ToolDto } from '#shared/types/registers'
import type { Transaction } from 'sequelize'
import type { SpecificationBody } from '#shared/schemas/specifications'
import { appendAudit } from '../database/audit-chain'
import { Specification, SpecificationTablePoint, TrendAlert, type Accumulator, type Tool } from '../models'

export function toSpecificationDto(specification: Specification): SpecificationDto {
  const {
    createdAt: _created,
    updatedAt: _updated,
    supersedesId: _supersedes,
    tablePoints,
    ...fields
  } = specification.get({ plain: true }) as Specification
  return {
    ...fields,
    tablePoints: (tablePoints ?? [])
      .map(point => ({
        temperature: point.temperature,
        temperatureUnit: point.temperatureUnit,
        pressure: point.pressure,
      }))
      .sort((a, b) => a.temperature - b.temperature),
  }
}

/** Accumulators as the pickers and registers show them, with the current specification of each part number. */
export async function toInstalledUnits(rows: Accumulator[]): Promise<InstalledUnitDto[]> {
  const current = await Specification.findAll({
    where: { status: 'current', partNumber: [...new Set(rows.map(row => row.partNumber))] },
    attributes: ['id', 'partNumber'],
  })
  const specificationFor = new Map(current.map(specification => [specification.partNumber, specification.id]))
  // Open trend alerts on the unit (gas loss) and on its system (pump cycles): a technician about to service it is told.
  const subjectsOf = (row: Accumulator) => [
    `precharge:${row.id}`,
    ...(row.aircraftId && row.system ? [`cycle:${row.aircraftId}:${row.system}`] : []),
  ]
  const open = await TrendAlert.findAll({
    where: { clearedAt: null, subject: rows.flatMap(subjectsOf) },
    attributes: ['subject', 'message'],
  })
  const alertFor = new Map(open.map(alert => [alert.subject, alert.message]))
  return rows.map(row => ({
    id: row.id,
    partNumber: row.partNumber,
    serialNumber: row.serialNumber,
    position: row.position,
    system: row.system,
    installedAt: row.installedAt,
    aircraft: row.aircraft
      ? {
          id: row.aircraft.id,
          registration: row.aircraft.registration,
          fleetNumber: row.aircraft.fleetNumber,
          type: row.aircraft.type,
          base: row.aircraft.base,
        }
      : null,
    specificationId: specificationFor.get(row.partNumber) ?? null,
    alerts: subjectsOf(row).flatMap(subject => (alertFor.has(subject) ? [alertFor.get(subject)!] : [])),
  }))
}

/**
 * Creates a specification revision with its table points (inside the caller's transaction),
 * marks the revision it supersedes, and audits both.
 */
export async function createRevision(
  body: SpecificationBody,
  supersedesId: number | null,
  actorId: number,
  transaction: Transaction,
): Promise<SpecificationDto> {
  const { tablePoints, ...fields } = body
  if (supersedesId) {
    await Specification.update({ status: 'superseded' }, { where: { id: supersedesId }, transaction })
    await appendAudit(
      {
        actorId,
        entity: 'specification',
        entityId: String(supersedesId),
        action: 'superseded',
        detail: { by: fields.revision },
      },
      transaction,
    )
  }
  const created = await Specification.create({ ...fields, status: 'current', supersedesId }, { transaction })
  for (const point of tablePoints)
    await SpecificationTablePoint.create({ ...point, specificationId: created.id }, { transaction })
  await appendAudit(
    {
      actorId,
      entity: 'specification',
      entityId: String(created.id),
      action: supersedesId ? 'revised' : 'created',
      detail: { partNumber: fields.partNumber, revision: fields.revision, supersedesId },
    },
    transaction,
  )
  const reloaded = await Specification.findByPk(created.id, {
    include: [{ model: SpecificationTablePoint, as: 'tablePoints' }],
    transaction,
  })
  return toSpecificationDto(reloaded!)
}

export function toToolDto(tool: Tool): ToolDto {
  const today = stationToday()
  const { createdAt: _created, updatedAt: _updated, ...fields } = tool.get({ plain: true })
  return {
    ...fields,
    calibrationExpired: tool.calibrationDue !== null && tool.calibrationDue < today,
    calibrationMissing: tool.kind === 'gauge' && tool.calibrationDue === null,
  }
}
