import type { QueryInterface } from 'sequelize'

const SEARCHED = ['work_order', 'registration', 'serial_number', 'part_number']
/** The list's order, then every column the list and the export show (server/services/worksheet-list.ts). */
const LIST_BY_CREATED = [
  'created_at', 'id', 'state', 'work_order', 'reason', 'performer_id', 'registration', 'fleet_number', 'position',
  'part_number', 'serial_number', 'as_found_verdict', 'as_left_verdict', 'corrects_id', 'performed_at', 'released_at',
]

/**
 * For a million worksheets and as many cycle checks.
 *
 * The search indexes carry the creation time and id after the lower-cased value, so the newest (or
 * oldest) match of a search in the list's default order is read from the index alone, however many
 * rows match and wherever they lie in the list: a search whose 100,000 matches were the oldest tenth
 * of a million worksheets walked the whole list first (3.6 s). The same indexes still serve the prefix
 * search itself (the lower-cased value leads).
 *
 * SQLite keeps a row's columns in order, and the list's columns (added by 0005) come after the JSON
 * content, so reading them walks the content's overflow pages: 15 s of a million-row export. On
 * SQLite an index in the list's default order carries every list column, so the list and the export
 * read the index alone (100,000 rows: 1.48 s → 0.07 s). PostgreSQL keeps large values out of the row.
 *
 * Cycle checks, newest first (the Trends page's list of checks): an index in that order, so a page is
 * read from the top instead of sorting 900,000 checks (145 ms).
 */
export async function up(queryInterface: QueryInterface): Promise<void> {
  const sequelize = queryInterface.sequelize
  const postgres = sequelize.getDialect() === 'postgres'
  for (const column of SEARCHED) {
    await sequelize.query(`DROP INDEX IF EXISTS worksheets_${column}_search`)
    await sequelize.query(
      `CREATE INDEX worksheets_${column}_search ON worksheets (lower(${column})${postgres ? ' text_pattern_ops' : ''}, created_at, id)`,
    )
  }
  if (!postgres) {
    await sequelize.query(
      `CREATE INDEX IF NOT EXISTS worksheets_list_by_created ON worksheets (${LIST_BY_CREATED.join(', ')})`,
    )
  }
  await queryInterface.addIndex('cycle_checks', ['checked_at', 'id'], { name: 'cycle_checks_newest_first' })
}

export async function down(queryInterface: QueryInterface): Promise<void> {
  await queryInterface.removeIndex('cycle_checks', 'cycle_checks_newest_first')
  const sequelize = queryInterface.sequelize
  await sequelize.query('DROP INDEX IF EXISTS worksheets_list_by_created')
  const postgres = sequelize.getDialect() === 'postgres'
  for (const column of SEARCHED) {
    await sequelize.query(`DROP INDEX IF EXISTS worksheets_${column}_search`)
    await sequelize.query(`CREATE INDEX worksheets_${column}_search ON worksheets (lower(${column})${postgres ? ' text_pattern_ops' : ''})`)
  }
}
