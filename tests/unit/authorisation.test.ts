import { describe, expect, it } from 'vitest'
import { authorisationRefusal, coveringAuthorisation, partNumberCovered, standingOf, type AuthorisationTerms } from '../../shared/utils/authorisation'

// Invented register entries for the demo operator (no source needed: they are the rule's own cases).
const inspector: AuthorisationTerms = {
  number: 'FMR-I-0107',
  privileges: 'inspect',
  scopeKind: 'part-numbers',
  scope: ['FA-2210', 'FA-2240-01'],
  issuedOn: '2025-01-15',
  expiresOn: '2027-01-14',
  suspendedAt: null,
  suspendedReason: null,
}
const work = { partNumber: 'FA-2210-03', aircraftType: 'Tarnwing 46', today: '2026-12-04' }

describe('certifying authorisations', () => {
  it('a family covers its dash numbers, not a longer number', () => {
    expect(partNumberCovered('FA-2210-03', 'FA-2210')).toBe(true)
    expect(partNumberCovered('fa-2210-03', 'FA-2210-03')).toBe(true)
    expect(partNumberCovered('FA-22100-01', 'FA-2210')).toBe(false)
    expect(partNumberCovered('FA-2260-02', 'FA-2210')).toBe(false)
  })

  it('says why, naming the authorisation: scope, privilege, expiry, suspension, not yet valid', () => {
    expect(authorisationRefusal(inspector, work, 'inspector')).toBeNull()
    expect(authorisationRefusal(inspector, { ...work, partNumber: 'FA-2260-02' }, 'inspector'))
      .toBe('Your authorisation FMR-I-0107 does not cover FA-2260-02 units.')
    expect(authorisationRefusal(inspector, work, 'performer')).toMatch(/covers inspection only/)
    expect(authorisationRefusal(inspector, { ...work, today: '2027-01-15' }, 'inspector')).toBe('Your authorisation FMR-I-0107 expired on 2027-01-14.')
    // The expiry day itself is still good (a calendar date at the station).
    expect(authorisationRefusal(inspector, { ...work, today: '2027-01-14' }, 'inspector')).toBeNull()
    expect(authorisationRefusal({ ...inspector, suspendedAt: new Date(), suspendedReason: 'Recurrent training overdue' }, work, 'inspector'))
      .toBe('Your authorisation FMR-I-0107 is suspended: Recurrent training overdue.')
    expect(authorisationRefusal(inspector, { ...work, today: '2025-01-14' }, 'inspector')).toMatch(/valid from 2025-01-15/)
    const types = { ...inspector, scopeKind: 'aircraft-types' as const, scope: ['Tarnwing 72'] }
    expect(authorisationRefusal(types, work, 'inspector')).toBe('Your authorisation FMR-I-0107 does not cover Tarnwing 46 aircraft.')
  })

  it('takes the first that covers; else the reason of the one that came closest', () => {
    const expired = { ...inspector, number: 'FMR-I-0001', expiresOn: '2026-01-01' }
    const other = { ...inspector, number: 'FMR-I-0002', scope: ['FA-9999'] }
    expect(coveringAuthorisation([other, expired, inspector], work, 'inspector')).toEqual({ authorisation: inspector })
    expect(coveringAuthorisation([other, expired], work, 'inspector')).toEqual({ refusal: 'Your authorisation FMR-I-0001 expired on 2026-01-01.' })
    expect(coveringAuthorisation([], work, 'inspector')).toMatchObject({ refusal: expect.stringMatching(/no certifying authorisation/) })
    expect(standingOf(expired, '2026-12-04')).toBe('expired')
  })
})
