import { createHash } from 'node:crypto'
import { Op, type Model, type ModelStatic, type Transaction } from 'sequelize'
import {
  Accumulator,
  AccumulatorInstallation,
  Aircraft,
  Attachment,
  CycleCheck,
  Signature,
  Specification,
  SpecificationTablePoint,
  Tool,
  User,
  Worksheet,
  listColumns,
} from '../models'

/**
 * The records whose content the audit trail vouches for. Each audit entry about one of them
 * carries the SHA-256 of the record's canonical content as it stood after the change, and
 * verification recomputes it from the current rows: an edit made to the database file behind
 * the application's back no longer matches. Fields that change without meaning (updatedAt,
 * a user's display preferences and session version) are left out.
 */
interface Child {
  model: ModelStatic<Model>
  foreignKey: string
  name: string
  exclude?: string[]
  /** Columns added later, left out while empty so records written before them keep their hash. */
  omitWhenNull?: string[]
}
/** `omitWhenNull`: columns added later, left out while empty so records written before them keep their hash. */
interface RecordKind {
  model: ModelStatic<Model>
  exclude: string[]
  children: Child[]
  omitWhenNull?: string[]
  /**
   * Columns kept on the row for lists, derived from hashed columns. Left out of the hash while they
   * agree with what they derive from (so older hashes stand); a stored value that disagrees is put
   * into the hashed content, so an edit to a list column behind the application's back shows.
   */
  derived?: (row: Record<string, unknown>) => Record<string, unknown>
}

export const RECORD_KINDS = {
  'worksheet': {
    model: Worksheet as ModelStatic<Model>,
    // The list's columns are derived from content and results, which are hashed.
    exclude: [
      'updatedAt',
      'registration',
      'fleetNumber',
      'position',
      'partNumber',
      'serialNumber',
      'asFoundVerdict',
      'asLeftVerdict',
      'gaugeId',
      'cartId',
    ],
    omitWhenNull: ['clientId'],
    derived: row => listColumns(row.content as Record<string, unknown>, row.results as Record<string, unknown>),
    children: [
      {
        model: Signature as ModelStatic<Model>,
        foreignKey: 'worksheetId',
        name: 'signatures',
        omitWhenNull: ['method', 'passkeyId', 'payload', 'signedFields', 'assertion', 'authorisation'],
      },
      { model: Attachment as ModelStatic<Model>, foreignKey: 'worksheetId', name: 'attachments' },
    ],
  },
  'specification': {
    model: Specification as ModelStatic<Model>,
    exclude: ['updatedAt'],
    children: [
      { model: SpecificationTablePoint as ModelStatic<Model>, foreignKey: 'specificationId', name: 'tablePoints' },
    ],
  },
  'tool': { model: Tool as ModelStatic<Model>, exclude: ['updatedAt'], children: [] },
  'user': {
    model: User as ModelStatic<Model>,
    exclude: ['updatedAt', 'preferences', 'sessionVersion'],
    omitWhenNull: ['stationIds', 'operatorIds', 'oidcSubject'],
    children: [],
  },
  'aircraft': { model: Aircraft as ModelStatic<Model>, exclude: ['updatedAt'], omitWhenNull: ['operatorId'], children: [] },
  'accumulator': {
    model: Accumulator as ModelStatic<Model>,
    exclude: ['updatedAt'],
    children: [
      { model: AccumulatorInstallation as ModelStatic<Model>, foreignKey: 'accumulatorId', name: 'installations' },
    ],
  },
  'cycle-check': {
    model: CycleCheck as ModelStatic<Model>,
    // The version counts writes, each of which is in the chain with the content it left.
    exclude: ['updatedAt', 'version'],
    omitWhenNull: ['withdrawnAt', 'withdrawnReason', 'withdrawnById'],
    children: [],
  },
} satisfies Record<string, RecordKind>

export type RecordKindName = keyof typeof RECORD_KINDS

export function isRecordKind(entity: string): entity is RecordKindName {
  return Object.hasOwn(RECORD_KINDS, entity)
}

/** A value in canonical form: keys sorted, dates as ISO strings, nothing undefined. */
export function canonical(value: unknown): unknown {
  // A date the file holds in a form that does not parse is still content (and a sign of tampering).
  if (value instanceof Date) return Number.isNaN(value.getTime()) ? 'invalid date' : value.toISOString()
  if (Array.isArray(value)) return value.map(canonical)
  if (value && typeof value === 'object') {
    return Object.fromEntries(
      Object.keys(value)
        .sort()
        .filter(key => (value as Record<string, unknown>)[key] !== undefined)
        .map(key => [key, canonical((value as Record<string, unknown>)[key])]),
    )
  }
  return value
}

export function sha256(text: string): string {
  return createHash('sha256').update(text).digest('hex')
}

type Row = Record<string, unknown>

function plain(row: Row, exclude: string[] = [], omitWhenNull: string[] = []): Row {
  return Object.fromEntries(
    Object.entries(row).filter(
      ([key, value]) => !exclude.includes(key) && !(value === null && omitWhenNull.includes(key)),
    ),
  )
}

/** The derived columns whose stored value is not what they derive from, as stored; null when all agree. */
function derivedDisagreements(stored: Row, derive: (row: Row) => Row): Row | null {
  const out = Object.entries(derive(stored)).filter(
    ([column, value]) => String(stored[column] ?? null) !== String(value ?? null),
  )
  return out.length ? Object.fromEntries(out.map(([column]) => [column, stored[column] ?? null])) : null
}

// Map.groupBy arrives with Node 21.
function groupBy<T, K>(items: T[], key: (item: T) => K): Map<K, T[]> {
  const groups = new Map<K, T[]>()
  for (const item of items) {
    const group = groups.get(key(item))
    if (group) group.push(item)
    else groups.set(key(item), [item])
  }
  return groups
}

/** The canonical content hashes of some records of one kind, read in the given transaction. */
export async function recordHashes(
  kind: RecordKindName,
  ids: number[],
  transaction?: Transaction,
): Promise<Map<number, string>> {
  const definition: RecordKind = RECORD_KINDS[kind]
  if (ids.length === 0) return new Map()
  const rows = await definition.model.findAll({ where: { id: { [Op.in]: ids } }, order: [['id', 'ASC']], transaction })
  const children = await Promise.all(
    definition.children.map(child =>
      child.model.findAll({ where: { [child.foreignKey]: { [Op.in]: ids } }, order: [['id', 'ASC']], transaction }),
    ),
  )
  const childrenOf = definition.children.map((child, index) =>
    groupBy(children[index]!, row => row.get(child.foreignKey) as number),
  )
  const hashes = new Map<number, string>()
  for (const row of rows) {
    const id = row.get('id') as number
    const ofRow = Object.fromEntries(definition.children.map((child, index) => [
      child.name,
      (childrenOf[index]!.get(id) ?? []).map(candidate => candidate.get({ plain: true }) as Row),
    ]))
    hashes.set(id, hashOfRow(kind, row.get({ plain: true }) as Row, ofRow))
  }
  return hashes
}

/**
 * The canonical content hash of one record given as the plain row the database answers (and its
 * children's rows by child name): what `recordHashes` computes after reading it. A bulk writer that
 * already holds the rows it wrote hashes them without reading them back.
 */
export function hashOfRow(kind: RecordKindName, row: Row, children: Record<string, Row[]> = {}): string {
  const definition: RecordKind = RECORD_KINDS[kind]
  const snapshot: Row = plain(row, definition.exclude, definition.omitWhenNull)
  const disagreeing = definition.derived ? derivedDisagreements(row, definition.derived) : null
  if (disagreeing) snapshot.storedOutOfStep = disagreeing
  for (const child of definition.children)
    snapshot[child.name] = (children[child.name] ?? [])
      .map(candidate => plain(candidate, child.exclude, child.omitWhenNull))
  return sha256(JSON.stringify(canonical(snapshot)))
}

export async function recordHash(kind: RecordKindName, id: number, transaction?: Transaction): Promise<string | null> {
  return (await recordHashes(kind, [id], transaction)).get(id) ?? null
}
