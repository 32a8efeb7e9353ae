/** Where a unit's next check falls, at the station, from today. */
export type DueBucket = 'overdue' | 'this-week' | 'this-month' | 'later'
export const DUE_BUCKET_LABELS: Record<DueBucket, string> = {
  'overdue': 'Overdue',
  'this-week': 'Due within 7 days',
  'this-month': 'Due within 30 days',
  'later': 'Due later',
}

/** One installed unit on the due list. */
export interface DueItem {
  accumulatorId: number
  registration: string
  aircraftType: string
  station: string
  position: string | null
  partNumber: string
  serialNumber: string
  /** The station's calendar date it is due (YYYY-MM-DD). */
  dueOn: string
  bucket: DueBucket
  /** Why it is due then, in words. */
  reason: string
  /** Brought forward from the scheduled date because its pre-charge trend leaves the band sooner. */
  broughtForward: boolean
  scheduledOn: string | null
  lastCheckOn: string | null
}

export interface DueListDto {
  today: string
  stations: string[]
  station: string | null
  /** The station's iCalendar feed (its key in the address), when a station is chosen. */
  calendarAddress: string | null
  counts: Record<DueBucket, number>
  items: DueItem[]
}
