import type { H3Event } from 'h3'

/**
 * The address users open Chargewell at, for what leaves the server and outlives the request — a printed
 * label, a link in an e-mail: NUXT_PUBLIC_URL when it is set, else the address this request came to.
 */
export function publicAddress(event?: H3Event): string {
  const configured = String(useRuntimeConfig().publicUrl ?? '').replace(/\/+$/, '')
  if (configured) return configured
  return event ? requestedURL(event).origin : 'http://localhost:3000'
}

/** An address only the server's own machine can open: localhost, 127.0.0.0/8, ::1. */
export function isLoopbackAddress(address: string): boolean {
  try {
    const host = new URL(address).hostname.replace(/^\[|\]$/g, '')
    return host === 'localhost' || host.endsWith('.localhost') || /^127\./.test(host) || host === '::1'
  }
  catch {
    return false
  }
}

/**
 * A printed label lives on the unit for years: a production server refuses to print one that only its own
 * machine could open (NUXT_ALLOW_LOOPBACK_LABELS=true allows it, for the demo and the tests on one machine).
 */
export function labelAddress(event: H3Event): string {
  const address = publicAddress(event)
  const allowed = import.meta.dev || String(useRuntimeConfig().allowLoopbackLabels) === 'true'
  if (!allowed && isLoopbackAddress(address)) {
    throw createError({
      status: 409,
      statusMessage: 'Conflict',
      message: `A label printed now would open ${address}, which only the server's own machine can reach. `
        + 'Set NUXT_PUBLIC_URL to the address the hangar\'s tablets open Chargewell at, then print the label.',
      data: { field: 'NUXT_PUBLIC_URL' },
    })
  }
  return address
}
