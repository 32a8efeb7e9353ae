/**
 * A size limit on every request body, before any route reads it: sign-in takes a few
 * kilobytes, uploads the attachment limit, CSV imports a few megabytes, everything else
 * 256 KiB. A declared length over the limit is refused at once, unread; a body without one
 * (chunked) is counted as it arrives and refused when it passes the limit, never buffered
 * beyond it. The body read here is handed to h3, so routes read it as usual.
 */
const RAW_BODY = Symbol.for('h3RawBody')
const KIB = 1024

function limitFor(path: string, uploadMaxBytes: number): number {
  if (path.startsWith('/api/auth/')) return 4 * KIB
  if (path.startsWith('/api/attachments')) return uploadMaxBytes + 64 * KIB
  if (path.startsWith('/api/records/verify')) return 40 * 1024 * KIB
  if (/^\/api\/[a-z-]+\/import(?:\?|$)/.test(path)) return 4 * 1024 * KIB
  return 256 * KIB
}

/** No form or API body nests deeper than this; a deeper one is refused before anything parses or walks it. */
const MAX_NESTING = 32
const [OPEN_BRACE, OPEN_BRACKET, CLOSE_BRACE, CLOSE_BRACKET, QUOTE, BACKSLASH] = [0x7B, 0x5B, 0x7D, 0x5D, 0x22, 0x5C]

/** How deep the JSON-looking brackets of a body nest (outside strings): one pass over the bytes. */
function nestingDepth(body: Buffer): number {
  let depth = 0
  let deepest = 0
  let inString = false
  for (let index = 0; index < body.length; index++) {
    const byte = body[index]!
    if (inString) {
      if (byte === BACKSLASH) index++
      else if (byte === QUOTE) inString = false
    }
    else if (byte === QUOTE) inString = true
    else if (byte === OPEN_BRACE || byte === OPEN_BRACKET) deepest = Math.max(deepest, ++depth)
    else if (byte === CLOSE_BRACE || byte === CLOSE_BRACKET) depth--
  }
  return deepest
}

function tooLarge(limit: number) {
  return createError({ status: 413, statusMessage: 'Payload Too Large', message: `The request is larger than this route accepts (${Math.round(limit / KIB)} KiB).` })
}

export default defineEventHandler(async (event) => {
  if (!['POST', 'PUT', 'PATCH', 'DELETE'].includes(event.method)) return
  const request = event.node.req
  const declared = Number.parseInt(request.headers['content-length'] ?? '', 10)
  const chunked = /\bchunked\b/i.test(String(request.headers['transfer-encoding'] ?? ''))
  if (!(declared > 0) && !chunked) return
  const limit = limitFor(event.path, Number(useRuntimeConfig().uploadMaxBytes))
  if (declared > limit) {
    setResponseHeader(event, 'connection', 'close')
    throw tooLarge(limit)
  }
  const body = await new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = []
    let size = 0
    let refused = false
    request.on('data', (chunk: Buffer) => {
      size += chunk.length
      if (refused) return
      if (size <= limit) return chunks.push(chunk)
      // Refused now; what still arrives is counted and dropped, never kept.
      refused = true
      chunks.length = 0
      reject(tooLarge(limit))
    })
    request.on('end', () => refused || resolve(Buffer.concat(chunks)))
    request.on('error', reject)
  }).catch((error) => {
    setResponseHeader(event, 'connection', 'close')
    throw error
  })
  const json = /^application\/json\b/i.test(String(request.headers['content-type'] ?? ''))
  if (json && nestingDepth(body) > MAX_NESTING)
    throw createError({ status: 400, statusMessage: 'Bad Request', message: `The request is nested more than ${MAX_NESTING} levels deep; no form of Chargewell sends that.` })
  ;(request as unknown as Record<symbol, unknown>)[RAW_BODY] = Promise.resolve(body)
})
