import { Op, QueryTypes, Utils, col, fn, literal, where as condition, type Order, type WhereOptions } from 'sequelize'
import type { WorksheetListQuery } from '#shared/schemas/worksheet'
import type { WorksheetListItem, WorksheetListPage } from '#shared/types/worksheet'
import { User, Worksheet } from '../models'
import { withinScope, type Scope } from './scope'

/**
 * The worksheet list at any size: it reads only the row's own list columns (never the JSON
 * content), pages by key set — the sort value and id of the row it continues from — so page
 * 500 costs what page 1 does, and counts at most COUNT_CAP matches ("10,000+" beyond).
 */
const COUNT_CAP = 10_000
// Kept in step with the covering index of migration 0009-million-rows (SQLite reads the list from it).
const LIST_ATTRIBUTES = [
  'id',
  'state',
  'workOrder',
  'reason',
  'performerId',
  'registration',
  'fleetNumber',
  'position',
  'partNumber',
  'serialNumber',
  'asFoundVerdict',
  'asLeftVerdict',
  'correctsId',
  'performedAt',
  'releasedAt',
  'createdAt',
] as const
const SEARCHED = ['work_order', 'registration', 'serial_number', 'part_number']
type Filters = Omit<WorksheetListQuery, 'cursor' | 'pageSize'>

/** Where the list continues: after (or before) the row with this sort value and id. */
interface Cursor {
  toward: 'after' | 'before'
  value: string | null
  id: number
}

function encodeCursor(cursor: Cursor): string {
  return Buffer.from(JSON.stringify([cursor.toward, cursor.value, cursor.id])).toString('base64url')
}

function decodeCursor(text: string): Cursor {
  try {
    const [toward, value, id] = JSON.parse(Buffer.from(text, 'base64url').toString('utf8'))
    if (
      (toward === 'after' || toward === 'before')
      && (typeof value === 'string' || value === null)
      && Number.isSafeInteger(id)
    )
      return { toward, value, id }
  }
  catch {
    /* refused below */
  }
  throw createError({
    status: 400,
    statusMessage: 'Bad Request',
    message: 'That page link is not valid; start again from the first page.',
    data: { issues: [{ path: ['cursor'], field: 'cursor', message: 'Not a page link from this list.' }] },
  })
}

/**
 * Case-insensitive "starts with" on the searched columns, by the lower-cased indexes of
 * migration 0005. On SQLite, `walkSortOrder` writes the terms so those indexes cannot be used
 * (a unary +): for a term that matches many rows, walking the sort order and stopping after one
 * page beats gathering every match and sorting it. PostgreSQL's planner makes that choice itself.
 */
function searchCondition(q: string, walkSortOrder = false, columns = SEARCHED): WhereOptions {
  const prefix = q.toLowerCase()
  const postgres = Worksheet.sequelize!.getDialect() === 'postgres'
  return {
    [Op.or]: columns.map((name) => {
      if (postgres) return condition(fn('lower', col(name)), { [Op.like]: `${escapeLike(prefix)}%` })
      // SQLite: a range on the expression index; U+10FFFF sorts after every character.
      const column = walkSortOrder ? literal(`+lower(\`${name}\`)`) : fn('lower', col(name))
      return condition(column, { [Op.gte]: prefix, [Op.lt]: `${prefix}${LAST_CHARACTER}` })
    }),
  }
}

/** Sorts after every character: `value < prefix + LAST_CHARACTER` holds for every value starting with prefix. */
const LAST_CHARACTER = '\u{10FFFF}'

/** SQLite, raw SQL: lower(column) starts with `prefix`, as a range its search index answers. */
function sqlitePrefixRange(column: string, prefix: string): string {
  const sequelize = Worksheet.sequelize!
  return `lower(\`${column}\`) >= ${sequelize.escape(prefix)} AND lower(\`${column}\`) < ${sequelize.escape(`${prefix}${LAST_CHARACTER}`)}`
}

/** Above this many matches a search is "dense": one page is found quickly by walking the sort order. */
const DENSE_MATCHES = 500

export function worksheetFilter(query: Partial<Filters>, walkSortOrder = false): WhereOptions {
  const parts: WhereOptions[] = []
  if (query.aircraftId) parts.push({ aircraftId: query.aircraftId })
  if (query.accumulatorId) parts.push({ accumulatorId: query.accumulatorId })
  if (query.state) parts.push({ state: query.state })
  if (query.performerId) parts.push({ performerId: query.performerId })
  if (query.toolId) parts.push({ [Op.or]: [{ gaugeId: query.toolId }, { cartId: query.toolId }] })
  if (query.from) parts.push({ createdAt: { [Op.gte]: new Date(`${query.from}T00:00:00Z`) } })
  if (query.to) parts.push({ createdAt: { [Op.lt]: new Date(Date.parse(`${query.to}T00:00:00Z`) + 86_400_000) } })
  if (query.q) parts.push(searchCondition(query.q, walkSortOrder))
  return { [Op.and]: parts }
}

const isDateSort = (sort: Filters['sort']) => sort === 'createdAt' || sort === 'performedAt'

const SORT_COLUMNS: Record<Filters['sort'], string> = {
  createdAt: 'created_at', performedAt: 'performed_at', state: 'state', workOrder: 'work_order',
}

/** A list column in raw SQL, as the list's queries name the table (by the model, `Worksheet`). */
function listColumn(column: string): string {
  const quote = (name: string) => Worksheet.sequelize!.getQueryInterface().quoteIdentifier(name)
  return `${quote('Worksheet')}.${quote(column)}`
}

/**
 * Rows beyond the cursor in the list's order: a row comparison, `(sort, id) < (value, id)`, which
 * SQLite and PostgreSQL both run as one range on the (sort, id) index. (The equivalent OR of two
 * conditions was applied by PostgreSQL as a filter over every row before the cursor, so a page's
 * cost grew with its depth.) A cursor on an empty sort value (no performed time yet) keeps the
 * two-part form, as a row comparison with NULL matches nothing.
 */
function keysetCondition(sort: Filters['sort'], ascending: boolean, cursor: Cursor, inclusive = false): WhereOptions {
  const value = cursor.value !== null && isDateSort(sort) ? new Date(cursor.value) : cursor.value
  const beyond = ascending ? Op.gt : Op.lt
  if (value === null) {
    const onward = inclusive ? (ascending ? Op.gte : Op.lte) : beyond
    return { [Op.or]: [{ [sort]: { [beyond]: value } }, { [sort]: value, id: { [onward]: cursor.id } }] }
  }
  const sequelize = Worksheet.sequelize!
  const row = `(${listColumn(SORT_COLUMNS[sort])}, ${listColumn('id')})`
  const operator = `${ascending ? '>' : '<'}${inclusive ? '=' : ''}`
  return literal(`${row} ${operator} (${sequelize.escape(value as string)}, ${sequelize.escape(cursor.id)})`) as never
}

/**
 * Where a dense search's first page starts: its first match in the list's order, found through the
 * search index (reading at most COUNT_CAP matches). Walking the sort order from there finds a page at
 * once even when every match lies at the far end of the list (a work-order year ten years back).
 */
async function firstMatch(filter: WhereOptions, sort: Filters['sort'], ascending: boolean): Promise<Cursor | null> {
  const sequelize = Worksheet.sequelize!
  const direction = ascending ? 'ASC' : 'DESC'
  // SQLite: a unary + keeps the sort column's index out, so the search index finds the matches.
  const sqlite = sequelize.getDialect() === 'sqlite'
  const order: Order = sqlite
    ? [[literal(`+${listColumn(SORT_COLUMNS[sort])}`), direction], [literal(`+${listColumn('id')}`), direction]]
    : [[sort, direction], ['id', direction]]
  const [row] = await findRows(filter, order, 1)
  return row ? { toward: 'after', value: sortValue(row, sort), id: row.id } : null
}

/** SQLite: how many distinct values of one searched column a search steps through before it reads the range instead. */
const HOP_VALUES = 1024
/** Below this many matches in one column, reading the column's range is as cheap as stepping through its values. */
const SMALL_RANGE = 2000

type DateKey = readonly [string, number]

/**
 * SQLite: the newest (or oldest) match of one searched column, one index seek per distinct value in the
 * prefix's range: the last (first) entry of each value's run in (lower(value), created_at, id) is that
 * value's newest (oldest) row. A registration prefix of 926 aircraft and 141,666 rows: 926 seeks, about
 * 5 ms, where reading the range took 17–34 ms and grew with the fleet. `undefined` when the range holds
 * more than HOP_VALUES values (every work order of a year is its own value): the caller reads the range.
 */
async function firstMatchByHops(
  column: string,
  prefix: string,
  ascending: boolean,
): Promise<DateKey | null | undefined> {
  const sequelize = Worksheet.sequelize!
  if (await manyValues(column, prefix)) return undefined
  const direction = ascending ? 'ASC' : 'DESC'
  const low = sequelize.escape(prefix)
  const high = sequelize.escape(`${prefix}${LAST_CHARACTER}`)
  // Each step's text: the row's date and zero-padded id (text order is key order), U+0001, then the value.
  const step = `created_at || ' ' || printf('%015d', id) || char(1) || lower(\`${column}\`)`
  const from = `FROM worksheets INDEXED BY worksheets_${column}_search`
  const order = `ORDER BY lower(\`${column}\`) ${direction}, created_at ${direction}, id ${direction} LIMIT 1`
  const past = ascending
    ? `lower(\`${column}\`) > substr(hop.x, instr(hop.x, char(1)) + 1) AND lower(\`${column}\`) < ${high}`
    : `lower(\`${column}\`) >= ${low} AND lower(\`${column}\`) < substr(hop.x, instr(hop.x, char(1)) + 1)`
  const [row] = await sequelize.query<{ values: number, key: string | null }>(
    `WITH RECURSIVE hop(x) AS (
      SELECT * FROM (SELECT ${step} ${from} WHERE ${sqlitePrefixRange(column, prefix)} ${order})
      UNION ALL
      SELECT (SELECT ${step} ${from} WHERE ${past} ${order}) FROM hop WHERE hop.x IS NOT NULL
      LIMIT ${HOP_VALUES + 1}
    )
    SELECT count(x) AS "values", ${ascending ? 'min' : 'max'}(substr(x, 1, instr(x, char(1)) - 1)) AS key FROM hop`,
    { type: QueryTypes.SELECT },
  )
  if (!row || row.values > HOP_VALUES) return undefined
  if (!row.key) return null
  const split = row.key.lastIndexOf(' ')
  return [storedDateIso(row.key.slice(0, split))!, Number(row.key.slice(split + 1))]
}

/**
 * SQLite: whether the prefix's range surely holds more than HOP_VALUES distinct values, read from its first
 * HOP_VALUES + 1 index entries in order (one short sequential read): when those are all different values,
 * stepping value by value would give up after HOP_VALUES + 1 seeks (5 ms wasted at a million rows, a work
 * order prefix of 100,000 values), so the caller goes straight to the range.
 */
async function manyValues(column: string, prefix: string): Promise<boolean> {
  const [row] = await Worksheet.sequelize!.query<{ values: number }>(
    `SELECT count(DISTINCT v) AS "values" FROM (SELECT lower(\`${column}\`) AS v FROM worksheets `
    + `INDEXED BY worksheets_${column}_search WHERE ${sqlitePrefixRange(column, prefix)} `
    + `ORDER BY lower(\`${column}\`) LIMIT ${HOP_VALUES + 1})`,
    { type: QueryTypes.SELECT },
  )
  return Number(row?.values ?? 0) > HOP_VALUES
}

/** The newest (or oldest) match of one searched column, read from its range of the search index. */
async function firstMatchInRange(column: string, prefix: string, ascending: boolean): Promise<DateKey | null> {
  const sequelize = Worksheet.sequelize!
  const postgres = sequelize.getDialect() === 'postgres'
  const direction = ascending ? 'ASC' : 'DESC'
  if (!postgres) {
    // SQLite: the range's newest (oldest) date by min/max over the search index (one pass, no sorter: 9.3
    // against 12.2 ms for 100,000 matches), then the id at that date by the list's date index.
    const [edge] = await sequelize.query<{ at: string | null }>(
      `SELECT ${ascending ? 'min' : 'max'}(created_at) AS at FROM worksheets INDEXED BY worksheets_${column}_search `
      + `WHERE ${sqlitePrefixRange(column, prefix)}`,
      { type: QueryTypes.SELECT },
    )
    if (!edge?.at) return null
    const [row] = await sequelize.query<{ id: number }>(
      `SELECT id FROM worksheets WHERE created_at = ${sequelize.escape(edge.at)} `
      + `AND +${sqlitePrefixRange(column, prefix).replace(' AND lower(', ' AND +lower(')} ORDER BY id ${direction} LIMIT 1`,
      { type: QueryTypes.SELECT },
    )
    return row ? [storedDateIso(edge.at)!, row.id] : null
  }
  const range = `lower(${column}) LIKE ${sequelize.escape(`${escapeLike(prefix)}%`)}`
  // The search index, not the date index: PostgreSQL is given an order no index holds (it walked the date
  // index backwards through 90,000 rows, 715 ms, for matches at the far end).
  const order = `created_at + interval '0 seconds' ${direction}, id + 0 ${direction}`
  const [row] = await sequelize.query<{ created_at: Date | string, id: number }>(
    `SELECT created_at, id FROM worksheets WHERE ${range} ORDER BY ${order} LIMIT 1`,
    { type: QueryTypes.SELECT },
  )
  return row ? [storedDateIso(row.created_at)!, row.id] : null
}

/**
 * SQLite: the newest (or oldest) worksheet ever written under this prefix, per searched column, as kept by
 * migration 0019's triggers (one lookup, where reading the range of a prefix of 100,000 work orders took 11 ms
 * at a million worksheets). A bound, not always a match (a value changed since leaves it behind): the walk
 * in date order starts there and steps over any row that no longer matches. Only prefixes shorter than the
 * value are kept (a whole value is one seek of its search index).
 */
async function keptPrefixBounds(prefix: string, ascending: boolean): Promise<Map<string, DateKey>> {
  const edge = ascending ? 'oldest' : 'newest'
  const rows = await Worksheet.sequelize!.query<{ column_name: string, at: string, id: number }>(
    // One seek per column on the table's key (column_name, prefix).
    `SELECT column_name, ${edge}_at AS at, ${edge}_id AS id FROM search_prefixes `
    + 'WHERE column_name IN (:columns) AND prefix = :prefix',
    { replacements: { prefix, columns: SEARCHED }, type: QueryTypes.SELECT },
  )
  return new Map(rows.map(row => [row.column_name, [storedDateIso(row.at)!, row.id] as const]))
}

const earlier = ([a, x]: DateKey, [b, y]: DateKey) => (a === b ? x - y : a < b ? -1 : 1)

/**
 * Where a dense search's first page starts in the list's default order (creation time), whatever the
 * number of matches: each searched column's index holds (lower(value), created_at, id), so the newest
 * (or oldest) match per column is read from the index alone (migration 0009-million-rows), and the first
 * of the four is where the page starts. Only for a search with no other filter (the index holds nothing
 * else). `matches` are the plain search's counts per column: a column with none is skipped. On SQLite a
 * column with many matches is first stepped through value by value (`firstMatchByHops`); the probe of
 * the list's newest rows (`probe`) is tried before a column's whole range is read.
 */
async function firstMatchByDate(
  q: string,
  ascending: boolean,
  matches: Record<string, number>,
  probe: () => Promise<RawRow[]>,
): Promise<{ start: Cursor | null } | { rows: RawRow[] }> {
  const sqlite = Worksheet.sequelize!.getDialect() === 'sqlite'
  const prefix = q.toLowerCase()
  if (!sqlite) {
    // PostgreSQL (measured at 100,000 worksheets): the newest rows first, then each column's range.
    const rows = await probe()
    if (rows.length) return { rows }
  }
  const found: DateKey[] = []
  const unresolved: string[] = []
  const kept = sqlite ? await keptPrefixBounds(prefix, ascending) : new Map<string, DateKey>()
  for (const column of SEARCHED) {
    if (matches[column] === 0) continue
    const key = kept.get(column) ?? (sqlite && matches[column]! > SMALL_RANGE
      ? await firstMatchByHops(column, prefix, ascending)
      : await firstMatchInRange(column, prefix, ascending))
    if (key === undefined) unresolved.push(column)
    else if (key) found.push(key)
  }
  if (unresolved.length) {
    // A search whose matches are spread through the list (a prefix of thousands of registrations)
    // finds its page among the newest rows; only one whose matches lie further reads the ranges.
    const rows = await probe()
    if (rows.length) return { rows }
    for (const column of unresolved) {
      const key = await firstMatchInRange(column, prefix, ascending)
      if (key) found.push(key)
    }
  }
  const first = found.sort((a, b) => earlier(a, b) * (ascending ? 1 : -1))[0]
  return { start: first ? { toward: 'after', value: first[0], id: first[1] } : null }
}

/** How many rows of the list's date order a dense search tries before it looks up its first match. */
const PROBE_ROWS = { sqlite: 2000, postgres: 5000 }

/**
 * A search's page from the first PROBE_ROWS rows of the list in date order (`limit` rows at most), or an
 * empty list when fewer than `limit` matches lie there (or the list is shorter: then the plain walk is
 * as cheap).
 */
async function probePage(pageFilter: WhereOptions, ascending: boolean, limit: number, order: Order): Promise<RawRow[]> {
  const direction = ascending ? 'ASC' : 'DESC'
  const [bound] = await Worksheet.sequelize!.query<{ created_at: Date | string, id: number }>(
    `SELECT created_at, id FROM worksheets ORDER BY created_at ${direction}, id ${direction} LIMIT 1 OFFSET ${PROBE_ROWS[Worksheet.sequelize!.getDialect() === 'sqlite' ? 'sqlite' : 'postgres']}`,
    { type: QueryTypes.SELECT },
  )
  if (!bound) return []
  const before = keysetCondition('createdAt', !ascending, { toward: 'after', value: storedDateIso(bound.created_at), id: bound.id }, true)
  const rows = await findRows({ [Op.and]: [pageFilter, before] }, order, limit)
  return rows.length >= limit ? rows : []
}

/**
 * A list row as the database gives it without building a model instance (several times
 * cheaper per row): dates arrive as Date objects from PostgreSQL and as text from SQLite.
 */
type RawRow = Pick<Worksheet, (typeof LIST_ATTRIBUTES)[number] extends infer Key ? Key & keyof Worksheet : never> & {
  performer?: { name: string | null }
}

function sortValue(row: RawRow, sort: Filters['sort']): string | null {
  return isDateSort(sort) ? storedDateIso(row[sort]) : (row[sort] as string)
}

export function toListItem(row: RawRow, performer = row.performer?.name ?? ''): WorksheetListItem {
  return {
    id: row.id,
    state: row.state,
    workOrder: row.workOrder,
    reason: row.reason,
    performerId: row.performerId,
    performer,
    registration: row.registration ?? '',
    fleetNumber: row.fleetNumber ?? '',
    position: row.position ?? '',
    partNumber: row.partNumber ?? '',
    serialNumber: row.serialNumber ?? '',
    asFoundVerdict: row.asFoundVerdict ?? null,
    asLeftVerdict: row.asLeftVerdict ?? null,
    correctsId: row.correctsId ?? null,
    performedAt: storedDateIso(row.performedAt),
    releasedAt: storedDateIso(row.releasedAt),
    createdAt: storedDateIso(row.createdAt)!,
  }
}

function findRows(where: WhereOptions, order: Order, limit: number): Promise<RawRow[]> {
  return Worksheet.findAll({
    where,
    attributes: [...LIST_ATTRIBUTES],
    include: [{ model: User, as: 'performer', attributes: ['name'] }],
    order,
    limit,
    raw: true,
    nest: true,
  }) as unknown as Promise<RawRow[]>
}

/** Matches, counted up to the cap by the database (a bounded scan of the index, not of the table). */
async function cappedCount(where: WhereOptions): Promise<number> {
  const sequelize = Worksheet.sequelize!
  const generator = sequelize.getQueryInterface().queryGenerator as {
    selectQuery: (table: string, options: object, model: unknown) => string
  }
  // The model's attribute names become column names, as findAll would map them.
  const options = Utils.mapOptionFieldNames(
    { attributes: [[literal('1'), 'one']], where, limit: COUNT_CAP + 1 } as never,
    Worksheet as never,
  ) as object
  const inner = generator.selectQuery('worksheets', options, Worksheet).replace(/;\s*$/, '')
  const [row] = await sequelize.query<{ total: number | string }>(
    `SELECT COUNT(*) AS total FROM (${inner}) AS capped`,
    { type: QueryTypes.SELECT },
  )
  return Number(row?.total ?? 0)
}

/**
 * A plain search's matches counted column by column, each up to the cap from its own search index (an
 * index range, where the four-way OR gathered every matching row id first: 9 ms for a registration prefix
 * at a million rows, against 1 ms). The total is exact when one column holds every match or one column
 * alone passes the cap; otherwise the rows matched in two columns are counted once by the OR.
 */
async function searchCounts(
  q: string,
  filter: WhereOptions,
): Promise<{ total: number, matches: Record<string, number> }> {
  const matches: Record<string, number> = {}
  for (const column of SEARCHED) matches[column] = await cappedCount(searchCondition(q, false, [column]))
  const columns = SEARCHED.filter(column => matches[column]! > 0)
  const total = columns.some(column => matches[column]! > COUNT_CAP)
    ? COUNT_CAP + 1
    : columns.length <= 1 ? matches[columns[0] ?? ''] ?? 0 : await cappedCount(filter)
  return { total, matches }
}

/** The worksheets the filters match, of the aircraft the user may see (server/services/scope.ts). */
export async function listWorksheets(query: WorksheetListQuery, scope: Scope): Promise<WorksheetListPage> {
  const cursor = query.cursor ? decodeCursor(query.cursor) : null
  const ascending = query.direction === 'asc'
  // Reading backwards (the previous page) walks the same order the other way, then turns it round.
  const walkAscending = cursor?.toward === 'before' ? !ascending : ascending
  const filter = withinScope(scope, worksheetFilter(query))
  // The search indexes hold no aircraft: a search narrowed to some aircraft takes the general path.
  const plainSearch = !!query.q && query.sort === 'createdAt' && scope.aircraftIds === null && Object.keys(query).every(key =>
    ['q', 'sort', 'direction', 'pageSize', 'cursor'].includes(key) || query[key as keyof typeof query] === undefined)
  // Counted first (a bounded, cheap count): how many match decides how a search is best run.
  // Column by column on SQLite (index-only ranges); PostgreSQL visits the table for each counted row
  // either way, and one count of the four-way condition was the faster there.
  const sqlite = Worksheet.sequelize!.getDialect() === 'sqlite'
  const { total, matches } = plainSearch && sqlite
    ? await searchCounts(query.q!, filter)
    : { total: await cappedCount(filter), matches: {} }
  const dense = !!query.q && total > DENSE_MATCHES
  const pageFilter = dense ? withinScope(scope, worksheetFilter(query, true)) : filter
  const direction = walkAscending ? 'ASC' : 'DESC'
  const order: Order = [
    [query.sort, direction],
    ['id', direction],
  ]
  // A dense search starts at its first match: read from the search indexes for a plain search in date
  // order (the first PROBE_ROWS rows of the list are tried before a column's whole range is read), found
  // among at most COUNT_CAP matches otherwise (beyond that, the walk starts at the top).
  const located = !dense || cursor
    ? { start: null }
    : plainSearch
      ? await firstMatchByDate(query.q!, walkAscending, matches,
          () => probePage(pageFilter, walkAscending, query.pageSize + 1, order))
      : { start: total <= COUNT_CAP ? await firstMatch(filter, query.sort, walkAscending) : null }
  const probed = 'rows' in located ? located.rows : undefined
  const start = 'start' in located ? located.start : null
  const where = cursor
    ? { [Op.and]: [pageFilter, keysetCondition(query.sort, walkAscending, cursor)] }
    : start
      ? { [Op.and]: [pageFilter, keysetCondition(query.sort, walkAscending, start, true)] }
      : pageFilter
  const found = probed ?? await findRows(where, order, query.pageSize + 1)
  const more = found.length > query.pageSize
  const rows = found.slice(0, query.pageSize)
  if (cursor?.toward === 'before') rows.reverse()
  const edge = (row: RawRow | undefined, toward: Cursor['toward']) =>
    row ? encodeCursor({ toward, value: sortValue(row, query.sort), id: row.id }) : null
  const backwards = cursor?.toward === 'before'
  return {
    items: rows.map(row => toListItem(row)),
    pageSize: query.pageSize,
    total: Math.min(total, COUNT_CAP),
    totalCapped: total > COUNT_CAP,
    next: backwards || more ? edge(rows.at(-1), 'after') : null,
    previous: (cursor && !backwards) || (backwards && more) ? edge(rows[0], 'before') : null,
  }
}

/**
 * Rows the export reads at a time. Each batch's rows are made at once, and a batch of a thousand
 * outlived the young generation's collections often enough that a million-row export grew the server's
 * memory by 150 MB before a full collection (35 MB at 250).
 */
const EXPORT_BATCH = 250

/**
 * Every matching row, EXPORT_BATCH at a time by key set, for the streaming export. The rows are read
 * without the join to their performer (SQLite reads them from the list's index alone); the performers'
 * names are looked up once each.
 */
export async function* allWorksheets(filters: Filters, scope: Scope): AsyncGenerator<WorksheetListItem[]> {
  let cursor: Cursor | null = null
  const ascending = filters.direction === 'asc'
  const direction = ascending ? 'ASC' : 'DESC'
  const names = new Map<number, string>()
  for (;;) {
    const filter = withinScope(scope, worksheetFilter(filters))
    const where: WhereOptions = cursor
      ? { [Op.and]: [filter, keysetCondition(filters.sort, ascending, cursor)] }
      : filter
    const rows = await Worksheet.findAll({
      where,
      attributes: [...LIST_ATTRIBUTES],
      order: [[filters.sort, direction], ['id', direction]],
      limit: EXPORT_BATCH,
      raw: true,
    }) as unknown as RawRow[]
    if (rows.length === 0) return
    const unknown = [...new Set(rows.map(row => row.performerId))].filter(id => id !== null && !names.has(id))
    if (unknown.length) {
      const users = await User.findAll({ where: { id: unknown }, attributes: ['id', 'name'], raw: true })
      for (const user of users) names.set(user.id, user.name ?? '')
    }
    yield rows.map(row => toListItem(row, names.get(row.performerId) ?? ''))
    // Other requests get their turn between batches (each batch is a few milliseconds of work).
    await new Promise(done => setImmediate(done))
    const last: RawRow = rows.at(-1)!
    cursor = { toward: 'after', value: sortValue(last, filters.sort), id: last.id }
  }
}
