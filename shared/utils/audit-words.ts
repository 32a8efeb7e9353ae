import { stationDisplay } from './station-time'
import { ROLE_LABELS, type Role } from '../types/user'

/** One audit entry as the audit view lists it. */
export interface AuditEventDto {
  id: number
  at: string
  actor: string | null
  entity: string
  entityId: string
  action: string
  /** What happened, in a sentence. */
  text: string
  /** The request that wrote it (x-request-id), to find it in the server's logs. */
  requestId?: string | null
}

const roles = (value: unknown) =>
  Array.isArray(value) && value.length
    ? value.map(role => ROLE_LABELS[role as Role] ?? String(role)).join(', ')
    : 'no role'
const RECORD: Record<string, string> = {
  'worksheet': 'worksheet',
  'specification': 'specification',
  'tool': 'tool',
  'user': 'user',
  'aircraft': 'aircraft',
  'accumulator': 'accumulator',
  'cycle-check': 'cycle check',
  'webhook': 'webhook endpoint',
  'api-token': 'API token',
}

/**
 * An audit entry in words: "changed the roles of Rowan Hale from Technician to Technician,
 * Inspector". `subject` names the record where it has a name (a user's name).
 */
export function describeAuditEvent(
  event: { entity: string, entityId: string, action: string, detail: Record<string, unknown> },
  subject?: string | null,
): string {
  const what = `${RECORD[event.entity] ?? event.entity} ${subject ?? event.entityId}`
  const detail = event.detail
  switch (`${event.entity}:${event.action}`) {
    case 'webhook:registered':
      return `registered ${what} (${String(detail.url)}) for ${Array.isArray(detail.events) ? detail.events.join(', ') : 'events'}`
    case 'webhook:changed':
      return `changed ${Object.keys((detail.to ?? {}) as object).join(', ') || 'the settings'} of ${what}`
    case 'webhook:replayed':
      return `replayed delivery ${String(detail.deliveryId)} (${String(detail.eventType)}) to ${what}`
    case 'user:roles-changed':
      return `changed the roles of ${subject ?? `user ${event.entityId}`} from ${roles(detail.from)} to ${roles(detail.to)}`
    case 'user:disabled':
      return `disabled the account of ${subject ?? `user ${event.entityId}`}`
    case 'user:enabled':
      return `enabled the account of ${subject ?? `user ${event.entityId}`}`
    case 'user:created':
      return `created the account of ${subject ?? `user ${event.entityId}`} with the roles ${roles(detail.roles)}`
    case 'user:password-reset':
      return `reset the password of ${subject ?? `user ${event.entityId}`}`
    case 'user:updated': {
      const changes = Object.entries(
        (detail.changes ?? {}) as Record<string, { from?: unknown, to?: unknown } | unknown>,
      )
      return `changed ${changes.map(([field, change]) => (typeof change === 'object' && change && 'to' in change ? `${field} to "${String(change.to ?? '')}"` : field)).join(', ') || 'the details'} of ${subject ?? `user ${event.entityId}`}`
    }
    case 'worksheet:started':
      return `started ${what}`
    case 'worksheet:synced-from-device': {
      const conflicts = Array.isArray(detail.conflicts) ? detail.conflicts.length : 0
      return `sent ${what} from a device with no signal (started ${stationDisplay().dateTime(String(detail.startedAt))}, ${String(detail.steps)} step(s)`
        + `${conflicts ? `, ${conflicts} change(s) to review` : ''})`
    }
    case 'worksheet:correction-started':
      return `started ${what} as a correction of worksheet ${String(detail.correctsId)}`
    case 'worksheet:step-saved':
      return `saved the ${String(detail.step)} step of ${what}`
    case 'worksheet:observation-kept':
      return `kept the ${String(detail.step)} step of ${what} as observed, not counted: ${String(detail.reason ?? '')}`
    case 'worksheet:signed':
      return `signed ${what} as performer`
    case 'worksheet:countersigned':
      return `countersigned ${what}; it is released`
    case 'worksheet:returned':
      return `returned ${what}: ${String(detail.reason ?? '')}`
    case 'worksheet:voided':
      return `voided ${what}: ${String(detail.reason ?? '')}`
    case 'worksheet:discarded':
      return `discarded the draft ${what}`
    case 'cycle-check:withdrawn':
      return `withdrew ${what}: ${String(detail.reason ?? '')}`
    case 'system:seeded':
      return 'loaded the demo data'
    default:
      if (event.action === 'updated' && detail.via === 'CSV import' && detail.changes && typeof detail.changes === 'object') {
        const changes = Object.entries(detail.changes as Record<string, { from?: unknown, to?: unknown }>)
          .map(([field, change]) => `${field} from "${String(change.from ?? '')}" to "${String(change.to ?? '')}"`)
        return `changed ${changes.join(', ')} of ${what} by CSV import`
      }
      if (event.action === 'integrity-baseline')
        return `vouched for the content of ${what} as it stood when the audit trail began to hash records`
      return `${event.action.replace(/-/g, ' ')} — ${what}`
  }
}
