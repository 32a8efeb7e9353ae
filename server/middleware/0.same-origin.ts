import type { H3Event } from 'h3'

const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
/** Bodies an HTML form on another site cannot send: JSON everywhere; files where files are taken. */
const UPLOADS = /^\/api\/(attachments|aircraft\/import|accumulators\/import|specifications\/import|tools\/import)\/?$/

function refuse(message: string): never {
  throw createError({ status: 403, statusMessage: 'Forbidden', message })
}

/** The origins this app answers as: the request's own (behind a trusted proxy, as forwarded) and NUXT_PUBLIC_URL. */
function ownOrigins(event: H3Event): Set<string> {
  const origins = new Set([requestedURL(event).origin])
  try {
    origins.add(new URL(String(useRuntimeConfig().publicUrl)).origin)
  }
  catch {
    /* no public address configured */
  }
  return origins
}

/**
 * Cross-site request forgery is refused for every state-changing API request, in one place: a
 * browser that says where the request comes from (Origin, Sec-Fetch-Site) must say this app; and a
 * body must be JSON (files only on the upload routes), which a plain HTML form on another site
 * cannot send. Other systems calling the API send neither header and are judged by their session.
 */
export default defineEventHandler((event) => {
  if (!event.path.startsWith('/api/') || !STATE_CHANGING.has(event.method)) return
  const origin = getRequestHeader(event, 'origin')
  if (origin !== undefined && !ownOrigins(event).has(origin))
    refuse(`Requests that change records must come from Chargewell itself, not from ${origin}.`)
  const site = getRequestHeader(event, 'sec-fetch-site')
  if (site !== undefined && site !== 'same-origin' && site !== 'none')
    refuse('Requests that change records must come from Chargewell itself, not from another site.')
  const type = (getRequestHeader(event, 'content-type') ?? '').split(';')[0]!.trim().toLowerCase()
  const hasBody = Number(getRequestHeader(event, 'content-length') ?? 0) > 0 || !!getRequestHeader(event, 'transfer-encoding')
  if (!hasBody && !type) return
  const path = event.path.split('?')[0]!
  const allowed = type === 'application/json'
    || (UPLOADS.test(path) && (type === 'multipart/form-data' || type === 'text/csv'))
    // A record PDF dropped on the verify page changes nothing; it is only read.
    || (path === '/api/records/verify' && type === 'application/pdf')
  if (!allowed)
    throw createError({
      status: 415,
      statusMessage: 'Unsupported Media Type',
      message: UPLOADS.test(path)
        ? 'Send the file as multipart/form-data (or CSV text as text/csv).'
        : 'Send the request body as JSON (content-type: application/json).',
    })
})
