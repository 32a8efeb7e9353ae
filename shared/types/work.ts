import type { WorksheetState } from './worksheet'

/** A worksheet as Home lists it. */
export interface WorkItem {
  id: number
  workOrder: string
  registration: string | null
  position: string | null
  state: WorksheetState
  at: string
}
export interface WorksheetQueue {
  count: number
  items: WorkItem[]
}

/** What waits for the signed-in user, by what their roles do (`GET /api/me/work`). */
export interface WaitingWork {
  /** Technician: their drafts, work returned to them, their work awaiting someone's countersign. */
  drafts?: WorksheetQueue
  returned?: WorksheetQueue
  submitted?: WorksheetQueue
  /** Inspector: others' work awaiting their countersign, oldest first. */
  toCountersign?: WorksheetQueue
  /** Engineer: units and systems the trends flag. */
  alerts?: { count: number, items: { subject: string, message: string, raisedAt: string, to: string }[] }
  /** Technician: their station's units overdue or due within 7 days, soonest first. */
  due?: { station: string, count: number, items: import('./due').DueItem[] }
  /** Admin: gauges and carts out of calibration, or due within 30 days. */
  tools?: { expired: number, dueSoon: number }
}
