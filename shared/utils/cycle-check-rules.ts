import { can } from '../abilities'
import type { Role } from '../types/user'
import type { Decision } from './worksheet-rules'

interface Actor { id: number, roles: readonly Role[] }
interface Check { recordedById: number, withdrawnAt: string | Date | null }

/** Correcting or withdrawing a cycle check: the one who recorded it, or an engineer; never once withdrawn. */
export function canChangeCycleCheck(actor: Actor, check: Check): Decision {
  if (check.withdrawnAt) return { allowed: false, status: 409, reason: 'This check was withdrawn; it is kept as it was. Record a new check instead.' }
  if (actor.id !== check.recordedById && !can(actor.roles, 'cycle-check.review')) {
    return { allowed: false, status: 403, reason: 'Only the person who recorded this check, or an engineer, may correct or withdraw it.' }
  }
  return { allowed: true }
}
