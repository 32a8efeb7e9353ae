import type { H3Event } from 'h3'

/**
 * The row version a client says it is acting on, from `If-Match: "7"` (the worksheet's ETag).
 * Absent: the server's own read is the expectation. Anything else is refused as bad input.
 */
export function expectedVersion(event: H3Event): number | undefined {
  const header = getRequestHeader(event, 'if-match')
  if (header === undefined || header.trim() === '*') return undefined
  const match = header.trim().match(/^(?:W\/)?"?(\d{1,9})"?$/)
  if (!match) {
    throw createError({ status: 400, statusMessage: 'Bad Request', message: 'If-Match must be the worksheet\'s version, e.g. "7".', data: { issues: [{ path: ['If-Match'], field: 'If-Match', message: 'Not a version.' }] } })
  }
  return Number(match[1])
}

/** The ETag of a versioned record: its row version. */
export function setVersionTag(event: H3Event, version: number): void {
  setResponseHeader(event, 'etag', `"${version}"`)
}
