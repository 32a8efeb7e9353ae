import type { Role } from '../types/user'
import type { WorksheetState } from '../types/worksheet'

/**
 * Record-level rules, asked by both the pages (to offer an action) and the routes (to allow
 * it). Each answers with the reason when the answer is no.
 */
interface Actor { id: number, roles: readonly Role[] }
interface Record_ { state: WorksheetState, performerId: number }

export type Decision = { allowed: true } | { allowed: false, status: 403 | 409, reason: string }

const yes: Decision = { allowed: true }
const no = (status: 403 | 409, reason: string): Decision => ({ allowed: false, status, reason })

export const EDITABLE_STATES: readonly WorksheetState[] = ['draft', 'returned']

/** Entering readings and signing: the performer, while the worksheet is a draft or returned. */
export function canEdit(actor: Actor, worksheet: Record_): Decision {
  if (!EDITABLE_STATES.includes(worksheet.state)) {
    return no(409, worksheet.state === 'voided'
      ? 'This worksheet is voided; it is kept as it is.'
      : 'This worksheet is signed and can no longer change. Record a correction as a new worksheet that points at it.')
  }
  if (actor.id !== worksheet.performerId) return no(403, 'Only the technician who performed the work may fill or sign this worksheet.')
  return yes
}

/** Countersigning or returning: an inspector who did not perform the work, while it awaits countersign. */
export function canInspect(actor: Actor, worksheet: Record_): Decision {
  if (!actor.roles.includes('inspector')) return no(403, 'Countersigning needs the inspector role.')
  if (actor.id === worksheet.performerId) return no(403, 'Independent inspection: you cannot countersign or return work you performed.')
  if (worksheet.state !== 'awaiting-countersign') return no(409, 'Only a worksheet awaiting countersign can be countersigned or returned.')
  return yes
}

/**
 * Voiding: an inspector or admin, of someone else's work that was never released; the record stays,
 * marked with the reason. A released record is never voided: a correction supersedes it.
 */
export function canVoid(actor: Actor, worksheet: Record_): Decision {
  if (!actor.roles.some(role => role === 'inspector' || role === 'admin')) return no(403, 'Voiding needs the inspector or admin role.')
  if (worksheet.state === 'voided') return no(409, 'This worksheet is already voided.')
  if (worksheet.state === 'released') {
    return no(409, 'A released record is never voided: a technician records a correction that supersedes it '
      + '(Start a correction, on this record).')
  }
  if (actor.id === worksheet.performerId) {
    return no(403, 'You cannot void work you performed: ask an inspector or another administrator '
      + '(a draft you never signed, you can discard).')
  }
  return yes
}

/** Discarding: the performer's own draft, never signed; it is kept, marked voided with the reason. */
export function canDiscard(actor: Actor, worksheet: Record_): Decision {
  if (worksheet.state !== 'draft') {
    return no(409, worksheet.state === 'returned'
      ? 'A returned worksheet was signed once: correct it and sign again, or ask an inspector to void it.'
      : 'Only a draft that was never signed can be discarded.')
  }
  if (actor.id !== worksheet.performerId) return no(403, 'Only the technician who started this draft may discard it.')
  return yes
}

/** A correction: a new worksheet pointing at a released one. */
export function canCorrect(actor: Actor, worksheet: Record_): Decision {
  if (!actor.roles.includes('technician')) return no(403, 'Corrections are recorded by a technician.')
  if (worksheet.state !== 'released') return no(409, 'Only a released worksheet is corrected by a new one; a draft or returned one is simply edited.')
  return yes
}
