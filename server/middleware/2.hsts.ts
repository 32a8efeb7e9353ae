/**
 * Strict-Transport-Security only when the request came over TLS (directly, or through a
 * trusted proxy that says so): over plain HTTP the header means nothing, and sent from a
 * development machine it would pin localhost to HTTPS.
 */
export default defineEventHandler((event) => {
  if (getRequestProtocol(event, { xForwardedProto: trustsProxy() }) === 'https') {
    setResponseHeader(event, 'strict-transport-security', 'max-age=31536000; includeSubDomains')
  }
})
