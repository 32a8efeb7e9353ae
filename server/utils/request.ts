import type { H3Event } from 'h3'

/**
 * How the browser reached us. Behind a reverse proxy (NUXT_TRUST_PROXY=true) the forwarded headers
 * tell the client's address, protocol and host; otherwise they are ignored (anyone could send them).
 */
export function trustsProxy(): boolean {
  // NUXT_TRUST_PROXY arrives as a string or a boolean, depending on how it was set.
  return String(useRuntimeConfig().trustProxy) === 'true'
}

/** The address the browser asked for, as it asked for it (protocol and host forwarded by a trusted proxy). */
export function requestedURL(event: H3Event): URL {
  const trust = trustsProxy()
  return getRequestURL(event, { xForwardedHost: trust, xForwardedProto: trust })
}
