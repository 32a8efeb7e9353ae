import QRCode from 'qrcode'
import type { H3Event } from 'h3'
import { Op, type Model, type ModelStatic, type Transaction } from 'sequelize'
import type { z } from 'zod'
import type { accumulatorQuerySchema, accumulatorUpdateSchema } from '#shared/schemas/accumulators'
import { accumulatorSchema } from '#shared/schemas/accumulators'
import { accumulatorCsvRow } from '#shared/schemas/csv'
import type { InstalledUnitDto } from '#shared/types/fleet'
import { appendAudit } from '../database/audit-chain'
import {
  Accumulator,
  AccumulatorInstallation,
  Aircraft,
  Specification,
  TrendAlert,
  Worksheet,
  type User,
} from '../models'
import { findOr404, notFound, unprocessable } from './audited-writes'
import { seesUnit, unitsWithinScope, withinScope, type Scope } from './scope'

/**
 * Installed accumulators: registered, corrected, moved between aircraft (each installation is
 * kept, so a unit's history follows it), imported; as the pickers and registers show them.
 */

const CONFLICT = 'That part and serial number is already registered.'
const WITH_AIRCRAFT = { include: [{ model: Aircraft, as: 'aircraft' }] }

/**
 * Accumulators with the current specification of each part number and the open trend alerts on the unit or its
 * system.
 */
export async function toInstalledUnits(rows: Accumulator[]): Promise<InstalledUnitDto[]> {
  const partNumbers = [...new Set(rows.map(row => row.partNumber))]
  const current = await Specification.findAll({
    where: { status: 'current', partNumber: partNumbers },
    attributes: ['id', 'partNumber'],
  })
  const specificationFor = new Map(current.map(specification => [specification.partNumber, specification.id]))
  // A technician about to service a unit is told of a gas leak on it or shortening pump cycles on its system.
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

/** 404 unless the unit exists and the scope covers it (server/services/scope.ts). */
export async function requireUnitInScope(scope: Scope, id: number): Promise<void> {
  const unit = await Accumulator.findByPk(id, { attributes: ['id', 'aircraftId'] })
  if (!unit || !(await seesUnit(scope, unit))) notFound('Accumulator')
}

async function installedUnit(id: number): Promise<InstalledUnitDto> {
  return (await toInstalledUnits([await findOr404(Accumulator, id, 'Accumulator', WITH_AIRCRAFT)]))[0]!
}

/** Opens an installation of a unit on an aircraft (inside the caller's transaction). */
export function install(
  accumulatorId: number,
  aircraftId: number,
  position: string,
  date: string,
  transaction: Transaction,
) {
  return AccumulatorInstallation.create(
    { accumulatorId, aircraftId, position, installedAt: date, removedAt: null, removalReason: null },
    { transaction },
  )
}

async function requireAircraft(id: number | null | undefined, field: string) {
  if (id && !(await Aircraft.findByPk(id))) unprocessable('No such aircraft.', field)
}

export async function listUnits(query: z.infer<typeof accumulatorQuerySchema>, scope: Scope) {
  const where = { true: { aircraftId: { [Op.ne]: null } }, false: { aircraftId: null } }
  const installed = query.installed === undefined ? {} : where[`${query.installed}`]
  const { total, totalCapped, rows } = await pageOf(Accumulator, {
    where: unitsWithinScope(scope, {
      ...searchWhere(query.q, ['partNumber', 'serialNumber', 'position', 'system', '$aircraft.registration$']),
      ...installed,
      ...(query.aircraftId ? { aircraftId: query.aircraftId } : {}),
      ...(query.partNumber ? { partNumber: query.partNumber } : {}),
      ...(query.type ? { '$aircraft.type$': query.type } : {}),
      ...(query.base ? { '$aircraft.base$': query.base } : {}),
    }),
    ...WITH_AIRCRAFT,
    order: [
      [{ model: Aircraft, as: 'aircraft' }, 'registration', query.direction.toUpperCase()],
      [query.sort, query.direction.toUpperCase()],
    ],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, totalCapped, items: await toInstalledUnits(rows) }
}

/** One unit with where it has been (installations) and its latest worksheets. */
/** One unit (404 outside the user's scope), with its history on the aircraft the user may see. */
export async function unitDetail(id: number, scope: Scope) {
  await requireUnitInScope(scope, id)
  const unit = await installedUnit(id)
  const installations = await AccumulatorInstallation.findAll({
    where: withinScope(scope, { accumulatorId: id }),
    include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration', 'fleetNumber'] }],
    order: [
      ['installedAt', 'DESC'],
      ['id', 'DESC'],
    ],
  })
  const worksheets = await Worksheet.findAll({
    where: withinScope(scope, { accumulatorId: id }),
    attributes: ['id', 'state', 'workOrder', 'performedAt', 'asFoundVerdict'],
    order: [['performedAt', 'DESC']],
    limit: 50,
  })
  return {
    ...unit,
    installations: installations.map(installation => ({
      aircraft: (installation as AccumulatorInstallation & { aircraft?: Aircraft }).aircraft?.registration ?? '',
      position: installation.position,
      installedAt: installation.installedAt,
      removedAt: installation.removedAt,
      removalReason: installation.removalReason,
    })),
    worksheets: worksheets.map(worksheet => ({
      id: worksheet.id,
      state: worksheet.state,
      workOrder: worksheet.workOrder,
      performedAt: worksheet.performedAt?.toISOString() ?? null,
      asFoundVerdict: worksheet.asFoundVerdict,
    })),
  }
}

/** Registers a unit, installed on an aircraft or in stores. */
export async function registerUnit(actor: User, body: z.infer<typeof accumulatorSchema>): Promise<InstalledUnitDto> {
  await requireAircraft(body.aircraftId, 'aircraftId')
  const created = await uniqueOr409(
    () =>
      writeTransaction(async (transaction) => {
        const unit = await Accumulator.create(body, { transaction })
        if (body.aircraftId) await install(unit.id, body.aircraftId, body.position!, body.installedAt!, transaction)
        await appendAudit(
          { actorId: actor.id, entity: 'accumulator', entityId: String(unit.id), action: 'created', detail: body },
          transaction,
        )
        return unit
      }),
    CONFLICT,
  )
  return installedUnit(created.id)
}

/** Corrects a unit's identity, or moves it (off its aircraft, or onto another), keeping its history. */
export async function changeUnit(
  actor: User,
  id: number,
  body: z.infer<typeof accumulatorUpdateSchema>,
): Promise<InstalledUnitDto> {
  const { move, ...fields } = body
  const unit = await findOr404(Accumulator, id, 'Accumulator')
  await requireAircraft(move?.aircraftId, 'move.aircraftId')
  if (move && unit.installedAt && move.date < unit.installedAt) {
    unprocessable(`The move date is before the unit was installed (${unit.installedAt}).`, 'move.date')
  }
  await uniqueOr409(
    () =>
      writeTransaction(async (transaction) => {
        if (Object.keys(fields).length) await unit.update(fields, { transaction })
        if (move) {
          await AccumulatorInstallation.update(
            { removedAt: move.date, removalReason: move.reason ?? null },
            { where: { accumulatorId: id, removedAt: null }, transaction },
          )
          if (move.aircraftId) await install(id, move.aircraftId, move.position!, move.date, transaction)
          const placed = move.aircraftId
            ? { position: move.position!, installedAt: move.date }
            : { position: null, installedAt: null }
          await unit.update({ aircraftId: move.aircraftId, ...placed }, { transaction })
        }
        const action = move ? (move.aircraftId ? 'moved' : 'removed') : 'updated'
        await appendAudit(
          {
            actorId: actor.id,
            entity: 'accumulator',
            entityId: String(id),
            action,
            detail: { fields, move: move ?? null },
          },
          transaction,
        )
      }),
    CONFLICT,
  )
  return installedUnit(id)
}

/** Units from CSV, installed where a registration is given: every row valid, or nothing imported. */
export async function importUnits(event: H3Event, actor: User) {
  const fleet = new Map((await Aircraft.findAll()).map(aircraft => [aircraft.registration, aircraft.id]))
  const rowSchema = accumulatorCsvRow
    .transform((row, context) => {
      const aircraftId = row.registration ? fleet.get(row.registration.toUpperCase()) : null
      if (row.registration && !aircraftId)
        context.addIssue({
          code: 'custom',
          path: ['registration'],
          message: `No aircraft ${row.registration} in the fleet.`,
        })
      const { registration: _registration, ...fields } = row
      return { ...fields, aircraftId: aircraftId ?? null }
    })
    .pipe(accumulatorSchema)
  // By part and serial number: a new unit is added (and installed); a known one takes an edited system. A move
  // between aircraft is made on the unit's page, which keeps its installation history, never by a cell.
  const moved = 'is where the unit is installed: move it on its page, which keeps its history.'
  return importCsv(event, rowSchema, async (row, transaction) => {
    const change = await upsertRow({
      model: Accumulator as ModelStatic<Model>,
      where: { partNumber: row.partNumber, serialNumber: row.serialNumber },
      fields: row,
      key: `${row.partNumber} ${row.serialNumber}`,
      entity: 'accumulator',
      actor,
      transaction,
      fixed: { aircraftId: moved, position: moved, installedAt: moved },
    })
    if (change.action === 'added' && row.aircraftId) {
      const where = { partNumber: row.partNumber, serialNumber: row.serialNumber }
      const created = (await Accumulator.findOne({ where, transaction }))!
      await install(created.id, row.aircraftId, row.position!, row.installedAt!, transaction)
    }
    return change
  })
}

/**
 * The QR code of a unit's label: it opens the unit's page, where its worksheets start. An SVG, crisp at any
 * print size.
 */
export async function unitLabelCode(id: number, address: string, scope: Scope): Promise<string> {
  await requireUnitInScope(scope, id)
  return QRCode.toString(`${address}/fleet/units/${id}`, {
    type: 'svg',
    errorCorrectionLevel: 'M',
    margin: 2,
  })
}
