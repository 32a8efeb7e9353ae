/**
 * When the database cannot take a write — the disk is full, the file or the database is read-only,
 * the server cannot reach it — a request is answered 503 in words, never a bare 500, and the health
 * route says so. The last outcome of a write is remembered here for the health report.
 */

const FAULTS: { test: RegExp, message: string }[] = [
  {
    test: /SQLITE_FULL|database or disk is full|53100|could not extend file|No space left on device/i,
    message: 'The server\'s disk is full, so nothing can be saved just now. Nothing was saved; what you entered is '
      + 'still on your screen. Tell your administrator, and try again once space has been freed.',
  },
  {
    test: /SQLITE_READONLY|attempt to write a readonly database|read-only|25006/i,
    message: 'The database is read-only just now, so nothing can be saved. Nothing was saved; tell your '
      + 'administrator.',
  },
  {
    test: /SQLITE_IOERR|SQLITE_CANTOPEN|disk I\/O error|unable to open database/i,
    message: 'The server cannot write to its database file just now (a disk error). Nothing was saved; tell your '
      + 'administrator and try again shortly.',
  },
  {
    test: /ECONNREFUSED|Connection terminated|SequelizeConnection|57P0[13]|too many clients/i,
    message: 'The server cannot reach its database just now. Nothing was saved; try again shortly.',
  },
]

let lastWrite: { ok: boolean, at: number, problem: string | null } = { ok: true, at: 0, problem: null }

function describe(error: unknown): string {
  const parts: unknown[] = [error]
  const cause = error as { parent?: unknown, original?: unknown, name?: string, code?: string }
  parts.push(cause?.parent, cause?.original, cause?.name, cause?.code, (cause?.parent as { code?: string })?.code)
  return parts.filter(Boolean).map(String).join(' ')
}

/** The plain words for a storage fault, or null when the error is something else. */
export function storageFault(error: unknown): string | null {
  if ((error as { statusCode?: number })?.statusCode) return null
  const text = describe(error)
  return FAULTS.find(fault => fault.test.test(text))?.message ?? null
}

/** A failed write: a storage fault becomes 503 in words (and is remembered); anything else is thrown as it was. */
export function asStorageFault(error: unknown): unknown {
  const message = storageFault(error)
  if (!message) return error
  lastWrite = { ok: false, at: Date.now(), problem: message }
  console.error('A write failed on the database:', describe(error))
  return createError({ status: 503, statusMessage: 'Service Unavailable', message, data: { storage: true } })
}

export function writeSucceeded(): void {
  lastWrite = { ok: true, at: Date.now(), problem: null }
}

/** The outcome of the last write, for the health route. */
export function lastWriteOutcome() {
  return lastWrite
}
