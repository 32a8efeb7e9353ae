import type { AuthorisationDto, AuthorisationPrivileges, AuthorisationScopeKind } from '../types/authorisation'
import type { SignatureCapacity } from '../types/worksheet'

/**
 * Whether a certifying authorisation covers a signature: the capacity (perform or inspect), the unit
 * (its part number, or its aircraft's type) and the date at the station. Pure, shared by the server
 * (which decides) and the pages (which say so before anyone taps to sign).
 */
export interface CoveredWork {
  partNumber: string
  aircraftType: string
  /** Today at the station (YYYY-MM-DD). */
  today: string
}
export interface AuthorisationTerms {
  number: string
  privileges: AuthorisationPrivileges
  scopeKind: AuthorisationScopeKind
  scope: string[]
  issuedOn: string
  expiresOn: string
  suspendedAt: string | Date | null
  suspendedReason: string | null
}

/** A part number is covered by itself or by its family: FA-2260 covers FA-2260-02, not FA-22600. */
export function partNumberCovered(partNumber: string, entry: string): boolean {
  const [wanted, given] = [partNumber.trim().toUpperCase(), entry.trim().toUpperCase()]
  return wanted === given || wanted.startsWith(`${given}-`)
}

export function standingOf(terms: Pick<AuthorisationTerms, 'issuedOn' | 'expiresOn' | 'suspendedAt'>, today: string): AuthorisationDto['standing'] {
  if (terms.suspendedAt) return 'suspended'
  if (today < terms.issuedOn) return 'not-yet-valid'
  if (today > terms.expiresOn) return 'expired'
  return 'valid'
}

/** Null when it covers the work; otherwise the reason, in words that name the authorisation. */
export function authorisationRefusal(
  terms: AuthorisationTerms,
  work: CoveredWork,
  capacity: SignatureCapacity,
): string | null {
  const needs = capacity === 'performer' ? 'perform' : 'inspect'
  if (terms.privileges !== 'both' && terms.privileges !== needs)
    return `Your authorisation ${terms.number} covers ${terms.privileges === 'perform' ? 'performing work' : 'inspection'} only, not ${capacity === 'performer' ? 'performing it' : 'independent inspection'}.`
  const inScope = terms.scopeKind === 'part-numbers'
    ? terms.scope.some(entry => partNumberCovered(work.partNumber, entry))
    : terms.scope.some(entry => entry.trim().toLowerCase() === work.aircraftType.trim().toLowerCase())
  if (!inScope) {
    return terms.scopeKind === 'part-numbers'
      ? `Your authorisation ${terms.number} does not cover ${work.partNumber} units.`
      : `Your authorisation ${terms.number} does not cover ${work.aircraftType} aircraft.`
  }
  const standing = standingOf(terms, work.today)
  if (standing === 'suspended') return `Your authorisation ${terms.number} is suspended: ${terms.suspendedReason ?? 'no reason given'}.`
  if (standing === 'expired') return `Your authorisation ${terms.number} expired on ${terms.expiresOn}.`
  if (standing === 'not-yet-valid') return `Your authorisation ${terms.number} is valid from ${terms.issuedOn}.`
  return null
}

/**
 * The first of a person's authorisations that covers the work, or the refusal to give: the reason of the
 * one that came closest (the right privilege and scope, but expired or suspended; else the first one).
 */
export function coveringAuthorisation<T extends AuthorisationTerms>(
  held: T[],
  work: CoveredWork,
  capacity: SignatureCapacity,
): { authorisation: T } | { refusal: string } {
  if (!held.length) {
    return { refusal: 'You hold no certifying authorisation in Chargewell\'s register; an administrator records it before you can sign.' }
  }
  const reasons = held.map(terms => ({ terms, reason: authorisationRefusal(terms, work, capacity) }))
  const covering = reasons.find(candidate => candidate.reason === null)
  if (covering) return { authorisation: covering.terms }
  const closest = reasons.find(candidate => /expired|suspended|valid from/.test(candidate.reason!)) ?? reasons[0]!
  return { refusal: closest.reason! }
}
