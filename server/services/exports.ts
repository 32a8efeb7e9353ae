import type { H3Event } from 'h3'
import type { z } from 'zod'
import type { worksheetExportQuerySchema } from '#shared/schemas/worksheet'
import { WORKSHEET_STATE_LABELS } from '#shared/types/worksheet'
import { Accumulator, Aircraft, Specification, SpecificationTablePoint, Tool } from '../models'
import { operatorNames } from './aircraft'
import { unitsWithinScope, withinScope, type Scope } from './scope'
import { toSpecificationDto } from './specifications'
import { allWorksheets } from './worksheet-list'

/**
 * Every CSV download: the registers in their import format (export, edit, import back) and the
 * worksheet list of any size, streamed in batches. All go through server/utils/csv.ts, which
 * neutralises cells a spreadsheet would run as formulas.
 */

const REGISTER_COLUMNS = {
  aircraft: ['registration', 'fleetNumber', 'type', 'base', 'operator', 'active'],
  accumulators: ['partNumber', 'serialNumber', 'system', 'registration', 'position', 'installedAt'],
  tools: [
    'kind',
    'assetNumber',
    'description',
    'rangeMax',
    'rangeUnit',
    'resolution',
    'accuracy',
    'accuracyUnit',
    'calibrationDue',
    'active',
  ],
  specifications: [
    'partNumber',
    'revision',
    'title',
    'accumulatorType',
    'gasVolume',
    'gasVolumeUnit',
    'pressureUnit',
    'pressureBasis',
    'referencePressure',
    'referenceTemperature',
    'referenceTemperatureUnit',
    'toleranceMinus',
    'tolerancePlus',
    'toleranceUnit',
    'correctionMethod',
    'gasModel',
    'maxPressure',
    'minPressure',
    'settleMinutes',
    'checkIntervalDays',
    'lossThresholdPerDay',
    'dataReference',
    'dataRevision',
    'tablePoints',
    'status',
  ],
} as const

type Register = keyof typeof REGISTER_COLUMNS

async function registerRows(register: Register, scope: Scope): Promise<Record<string, unknown>[]> {
  switch (register) {
    case 'aircraft': {
      const nameOf = await operatorNames()
      return (await Aircraft.findAll({ where: withinScope(scope, {}, 'id'), order: [['registration', 'ASC']] }))
        .map(row => ({ ...row.get({ plain: true }), operator: nameOf(row.operatorId ?? null) }))
    }
    case 'tools':
      return (
        await Tool.findAll({
          order: [
            ['kind', 'DESC'],
            ['assetNumber', 'ASC'],
          ],
        })
      ).map(row => row.get({ plain: true }))
    case 'accumulators': {
      const rows = await Accumulator.findAll({
        where: unitsWithinScope(scope),
        include: [{ model: Aircraft, as: 'aircraft' }],
        order: [
          ['partNumber', 'ASC'],
          ['serialNumber', 'ASC'],
        ],
      })
      return rows.map(row => ({ ...row.get({ plain: true }), registration: row.aircraft?.registration }))
    }
    case 'specifications': {
      const rows = await Specification.findAll({
        include: [{ model: SpecificationTablePoint, as: 'tablePoints' }],
        order: [
          ['partNumber', 'ASC'],
          ['revision', 'ASC'],
        ],
      })
      // Table points in one cell: "-40 C 1170; 0 C 1390".
      return rows.map(toSpecificationDto).map(row => ({
        ...row,
        tablePoints: row.tablePoints
          .map(point => `${point.temperature} ${point.temperatureUnit} ${point.pressure}`)
          .join('; '),
      }))
    }
  }
}

/** A register as CSV, in the format its import reads: of aircraft and units, those the user may see. */
export async function exportRegister(event: H3Event, register: Register, scope: Scope): Promise<string> {
  return sendCsv(event, register, await registerRows(register, scope), [...REGISTER_COLUMNS[register]])
}

const WORKSHEET_COLUMNS = [
  'Worksheet',
  'State',
  'Work order',
  'Registration',
  'Fleet number',
  'Position',
  'Part number',
  'Serial number',
  'Performer',
  'As-found verdict',
  'As-left verdict',
  'Corrects worksheet',
  'Performed at',
  'Released at',
]

/** Every worksheet the filters match, streamed a thousand rows at a time: any size, constant memory, no cap. */
export function exportWorksheets(event: H3Event, query: z.infer<typeof worksheetExportQuerySchema>, scope: Scope) {
  return streamCsv(
    event,
    'worksheets',
    WORKSHEET_COLUMNS,
    (async function* () {
      for await (const batch of allWorksheets(query, scope)) {
        yield batch.map(item => [
          item.id,
          WORKSHEET_STATE_LABELS[item.state],
          item.workOrder,
          item.registration,
          item.fleetNumber,
          item.position,
          item.partNumber,
          item.serialNumber,
          item.performer,
          item.asFoundVerdict ?? '',
          item.asLeftVerdict ?? '',
          item.correctsId ?? '',
          item.performedAt ?? '',
          item.releasedAt ?? '',
        ])
      }
    })(),
  )
}
