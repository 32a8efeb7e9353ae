/** Record states, in our own words: draft → awaiting countersign → released; returned and voided beside them. */
export const WORKSHEET_STATES = ['draft', 'awaiting-countersign', 'released', 'returned', 'voided'] as const
export type WorksheetState = (typeof WORKSHEET_STATES)[number]

export const WORKSHEET_STATE_LABELS: Record<WorksheetState, string> = {
  'draft': 'Draft',
  'awaiting-countersign': 'Awaiting countersign',
  'released': 'Released',
  'returned': 'Returned',
  'voided': 'Voided',
}

export const WORKSHEET_REASONS = ['scheduled', 'defect', 'after-replacement'] as const
export type WorksheetReason = (typeof WORKSHEET_REASONS)[number]
