/** A date as the database gives it: a Date from PostgreSQL, text from SQLite. */
export type StoredDate = Date | string

/** SQLite's text form of a UTC date as Sequelize writes it: 'YYYY-MM-DD HH:MM:SS.SSS +00:00'. */
const SQLITE_UTC = /^(\d{4}-\d{2}-\d{2}) (\d{2}:\d{2}:\d{2}\.\d{3}) \+00:00$/

/**
 * A stored date in ISO form. SQLite's text is rewritten, not parsed: parsing three dates a row was a
 * tenth of a million-row export's time.
 */
export function storedDateIso(value: StoredDate): string
export function storedDateIso(value: StoredDate | null | undefined): string | null
export function storedDateIso(value: StoredDate | null | undefined): string | null {
  if (value === null || value === undefined) return null
  if (value instanceof Date) return value.toISOString()
  const utc = SQLITE_UTC.exec(value)
  return utc ? `${utc[1]}T${utc[2]}Z` : new Date(value).toISOString()
}

/** An instant as Sequelize writes it into a SQLite DATE column (what `storedDateIso` reads back). */
export function sqliteDateText(value: Date): string {
  return `${value.toISOString().replace('T', ' ').replace('Z', '')} +00:00`
}
