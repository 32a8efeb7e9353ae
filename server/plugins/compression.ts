import { promisify } from 'node:util'
import { brotliCompress, constants, gzip } from 'node:zlib'

const brotli = promisify(brotliCompress)
const gzipped = promisify(gzip)
const BROTLI = { [constants.BROTLI_PARAM_QUALITY]: 4, [constants.BROTLI_PARAM_MODE]: constants.BROTLI_MODE_TEXT }
/** Below this a compressed answer is hardly smaller and costs more than it saves. */
const SMALLEST = 1024

/**
 * Pages (server-rendered HTML) and JSON answers leave compressed when the client asks
 * (`Accept-Encoding: br` or `gzip`); static files are compressed at build time
 * (`nitro.compressPublicAssets`). Streams (CSV exports, PDFs) and answers that already carry an
 * encoding are left as they are. Brotli at quality 4 (fast enough for a dynamic answer, smaller
 * than gzip); compression runs on libuv's thread pool, off the event loop.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('beforeResponse', async (event, response: { body?: unknown }) => {
    const accepted = getRequestHeader(event, 'accept-encoding') ?? ''
    const encoding = /\bbr\b/.test(accepted) ? 'br' : /\bgzip\b/.test(accepted) ? 'gzip' : null
    if (!encoding || event.method === 'HEAD' || getResponseHeader(event, 'content-encoding')) return
    // Nuxt renders an error page by fetching it inside the server and copying its text: that one stays plain.
    if (getRequestHeader(event, 'x-nuxt-error')) return
    const body = response.body
    let text: string
    if (typeof body === 'string') {
      text = body
    }
    else if (Array.isArray(body) || (body !== null && typeof body === 'object' && Object.getPrototypeOf(body) === Object.prototype)) {
      text = JSON.stringify(body)
      if (!getResponseHeader(event, 'content-type')) setResponseHeader(event, 'content-type', 'application/json')
    }
    else {
      return
    }
    if (Buffer.byteLength(text) < SMALLEST) return
    const compressed = encoding === 'br'
      ? await brotli(text, { params: BROTLI })
      : await gzipped(text, { level: 6 })
    appendResponseHeader(event, 'vary', 'Accept-Encoding')
    setResponseHeader(event, 'content-encoding', encoding)
    removeResponseHeader(event, 'content-length')
    response.body = compressed
  })
})
