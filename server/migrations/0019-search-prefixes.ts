import type { QueryInterface } from 'sequelize'

const SEARCHED = ['work_order', 'registration', 'serial_number', 'part_number']
/** Prefixes kept: one character up to one short of the whole value, at most this long. */
const LONGEST = 16
const LENGTHS = `(${Array.from({ length: LONGEST }, (_, index) => `SELECT ${index + 1} AS n`).join(' UNION ALL ')})`

/**
 * SQLite: the newest and oldest worksheet (by creation time and id) under each prefix of each searched
 * column, kept by triggers as worksheets are written. A search whose matches are many distinct values (a
 * year's work orders: 100,000 values at a million worksheets) found where its first page starts by reading
 * its whole range of the search index (11 ms, growing with the fleet); under a kept prefix it is one lookup.
 *
 * The bounds only ever widen: a value changed or a row removed leaves its old prefixes' bounds as they were,
 * so a bound may name a row that no longer matches. It is still where the walk in date order may start
 * (no match lies beyond it): the walk steps over the rows between. PostgreSQL finds the first match its own
 * way (server/services/worksheet-list.ts) and has no such table.
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  if (sequelize.getDialect() !== 'sqlite') return
  await sequelize.query(`CREATE TABLE search_prefixes (
    column_name TEXT NOT NULL,
    prefix TEXT NOT NULL,
    newest_at TEXT NOT NULL,
    newest_id INTEGER NOT NULL,
    oldest_at TEXT NOT NULL,
    oldest_id INTEGER NOT NULL,
    PRIMARY KEY (column_name, prefix)
  ) WITHOUT ROWID`)
  await fillSearchPrefixes(queryInterface)
  for (const [event, when] of [['insert', 'AFTER INSERT'], ['update', `AFTER UPDATE OF ${SEARCHED.join(', ')}`]] as const) {
    const statements = SEARCHED.map(column => `
      INSERT INTO search_prefixes
        SELECT '${column}', substr(lower(NEW.${column}), 1, lengths.n), NEW.created_at, NEW.id, NEW.created_at, NEW.id
        FROM ${LENGTHS} AS lengths WHERE lengths.n < length(NEW.${column})
      ON CONFLICT (column_name, prefix) DO UPDATE SET
        newest_at = CASE WHEN (excluded.newest_at, excluded.newest_id) > (newest_at, newest_id) THEN excluded.newest_at ELSE newest_at END,
        newest_id = CASE WHEN (excluded.newest_at, excluded.newest_id) > (newest_at, newest_id) THEN excluded.newest_id ELSE newest_id END,
        oldest_at = CASE WHEN (excluded.oldest_at, excluded.oldest_id) < (oldest_at, oldest_id) THEN excluded.oldest_at ELSE oldest_at END,
        oldest_id = CASE WHEN (excluded.oldest_at, excluded.oldest_id) < (oldest_at, oldest_id) THEN excluded.oldest_id ELSE oldest_id END;`)
    await sequelize.query(`CREATE TRIGGER worksheets_search_prefixes_${event} ${when} ON worksheets BEGIN${statements.join('')}
    END`)
  }
}

/**
 * SQLite: the table filled afresh from the worksheets there are, each prefix's newest and oldest (date, then
 * id) in one pass per column (also after a bulk load that ran without the triggers).
 */
export async function fillSearchPrefixes(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  await sequelize.query('DELETE FROM search_prefixes')
  const key = `created_at || char(1) || printf('%015d', id)`
  const at = (value: string) => `substr(${value}, 1, instr(${value}, char(1)) - 1)`
  const id = (value: string) => `CAST(substr(${value}, instr(${value}, char(1)) + 1) AS INTEGER)`
  for (const column of SEARCHED) {
    await sequelize.query(`INSERT INTO search_prefixes
      SELECT '${column}', prefix, ${at('newest')}, ${id('newest')}, ${at('oldest')}, ${id('oldest')} FROM (
        SELECT substr(lower(${column}), 1, lengths.n) AS prefix, max(${key}) AS newest, min(${key}) AS oldest
        FROM worksheets JOIN ${LENGTHS} AS lengths ON lengths.n < length(${column})
        GROUP BY prefix
      )`)
  }
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  if (sequelize.getDialect() !== 'sqlite') return
  await sequelize.query('DROP TRIGGER IF EXISTS worksheets_search_prefixes_insert')
  await sequelize.query('DROP TRIGGER IF EXISTS worksheets_search_prefixes_update')
  await sequelize.query('DROP TABLE IF EXISTS search_prefixes')
}
