/** Record states, in our own words: draft → awaiting countersign → released; returned and voided beside them. */
import type { AssessmentSummary } from '../utils/worksheet-results'
import type { Ambient, Pressure, Temperature } from '../gas/types'
import type { SpecificationDto } from './registers'

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

export interface ToolSnapshot {
  id: number
  assetNumber: string
  description: string
  calibrationDue: string | null
  /** ± accuracy in a pressure unit, as carried into the verdict (gauges only). */
  accuracy?: { value: number, unit: Pressure['unit'] }
  /** The smallest step the gauge shows (gauges only; worksheets from 2026-12 on). */
  resolution?: { value: number, unit: Pressure['unit'] }
}

/** What the performer entered, step by step. Times are ISO strings stamped by the server. */
/** One step as the server received it. */
export interface StepReceipt {
  step: string
  receivedAt: string
  claimedAt?: string
}

/**
 * A step taken on a device with no signal that the server could not count when it arrived (a gauge whose
 * calibration had lapsed, a reading that needed a step refused before it). A reading is a one-time
 * observation: it stays on the record as taken, with its time, the gauge in hand and why it does not count.
 */
export interface WorksheetObservation {
  step: string
  /** What the technician entered, as the device sent it. */
  values: Record<string, unknown>
  /** When it was taken: the device's time within the server's bounds; the device's own claim beside it. */
  takenAt: string
  claimedAt?: string
  receivedAt: string
  /** The gauge the technician had chosen when it was taken. */
  gauge?: { id: number, assetNumber: string }
  reason: string
}

export interface WorksheetContent {
  specification: Omit<SpecificationDto, 'status'>
  aircraft: { id: number, registration: string, fleetNumber: string, type: string }
  accumulator: { id: number, partNumber: string, serialNumber: string, position: string }
  preparation?: Partial<Record<PreparationCheck, string>>
  tools?: { gauge: ToolSnapshot, cart: ToolSnapshot }
  conditions?: {
    gasTemperature: Temperature
    temperatureMethod: 'ambient-shade' | 'shell'
    minutesSinceOperated: number
    ambient: Ambient
  }
  asFound?: { reading: Pressure, recordedAt: string }
  action?: { kind: 'none' | 'charge' | 'vent', recordedAt: string }
  asLeft?: {
    reading: Pressure
    gasTemperature: Temperature
    recordedAt: string
    /** Confirmed by the technician: moved with no action recorded. */ confirmedUnchanged?: boolean
  }
  /**
   * Filled on a device with no signal and sent later: what the server could not accept, and the technician's
   * review of it.
   */
  offline?: {
    clientId: string
    startedAt: string
    syncedAt: string
    conflicts: string[]
    reviewedAt?: string
    /** SHA-256 of the steps as the device sent them: a later send that differs is answered as a conflict. */
    stepsDigest?: string
  }
  /**
   * When the server received each step, and the time the device claimed for it where it gave one (a step kept
   * on a device with no signal). The record's time is the server's; the claim is kept as the device's word.
   */
  timeline?: StepReceipt[]
  /** Steps taken on a device that could not count when they reached the server: kept, never dropped. */
  observations?: WorksheetObservation[]
  finish?: {
    valveLeakCheck: boolean
    capFitted: boolean
    remarks: string
    unserviceableReference: string | null
    recordedAt: string
  }
}

export interface WorksheetResults {
  asFound?: AssessmentSummary
  asLeft?: AssessmentSummary
}

export const PREPARATION_CHECKS = ['systemDepressurised', 'aircraftSafe', 'eyeProtection', 'nitrogenOnly'] as const
export type PreparationCheck = (typeof PREPARATION_CHECKS)[number]

export const PREPARATION_LABELS: Record<PreparationCheck, string> = {
  systemDepressurised:
    'Hydraulic system depressurised: system gauge reads zero (the pre-charge cannot be read otherwise)',
  aircraftSafe: 'Aircraft made safe for maintenance (controls, gear and doors as the approved data requires)',
  eyeProtection: 'Eye protection on',
  nitrogenOnly: 'Nitrogen only: dry, oil-free nitrogen — never oxygen or shop air',
}

export const WORKSHEET_STEPS = [
  'identify',
  'preparation',
  'tools',
  'conditions',
  'asFound',
  'action',
  'asLeft',
  'finish',
  'sign',
] as const
export type WorksheetStep = (typeof WORKSHEET_STEPS)[number]

export const PERFORMER_STATEMENT
  = 'I certify that the servicing recorded here was carried out in accordance with the approved maintenance data, and that the readings are the ones I took.'
export const INSPECTOR_STATEMENT
  = 'I certify that I have independently inspected the work recorded here, that I did not perform it, and that I found it satisfactory.'

/** In what capacity a person signs a worksheet: the one who did the work, or the independent inspector. */
export type SignatureCapacity = 'performer' | 'inspector'

export interface SignatureDto {
  capacity: SignatureCapacity
  name: string
  authorisationNumber: string | null
  statement: string
  signedAt: string
  /** The signing round: one more each time the record was returned. */
  round: number
  /** password or passkey; null for signatures made before passkeys existed (password). */
  method: 'password' | 'passkey' | null
  /** The passkey's public-key fingerprint (passkey signatures). */
  keyFingerprint: string | null
}

export interface WorksheetDto {
  id: number
  state: WorksheetState
  /** Row version, also the ETag: send it back as If-Match so a change acts on what was seen. */
  version: number
  round: number
  workOrder: string
  reason: WorksheetReason
  performer: { id: number, name: string }
  /** The station of the aircraft, whose time zone the record's dates are shown in. */
  station?: { name: string, timeZone: string } | null
  correctsId: number | null
  correctedBy: number[]
  content: WorksheetContent
  results: WorksheetResults
  engineVersion: string
  serviceable: boolean | null
  returnReason: string | null
  voidReason: string | null
  performedAt: string | null
  submittedAt: string | null
  releasedAt: string | null
  createdAt: string
  updatedAt: string
  signatures: SignatureDto[]
  attachments: {
    id: number
    kind: string
    originalName: string
    mimeType: string
    sizeBytes: number
    sha256: string | null
  }[]
  /** The settle time's end, when a charge or vent started it. */
  settleUntil: string | null
}

/** One row of the worksheet list (and of its CSV export). */
export interface WorksheetListItem {
  id: number
  state: WorksheetState
  workOrder: string
  reason: WorksheetReason
  performerId: number
  performer: string
  registration: string
  fleetNumber: string
  position: string
  partNumber: string
  serialNumber: string
  asFoundVerdict: string | null
  asLeftVerdict: string | null
  correctsId: number | null
  performedAt: string | null
  releasedAt: string | null
  createdAt: string
}

/** A page of the worksheet list; `next` and `previous` are cursors to send back as `cursor`. */
export interface WorksheetListPage {
  items: WorksheetListItem[]
  pageSize: number
  /** Matches, counted up to 10,000; `totalCapped` when there are more. */
  total: number
  totalCapped: boolean
  next: string | null
  previous: string | null
}

/**
 * A worksheet as the step forms see it: from the server (its numeric id), or kept on this device
 * while there is no signal (its client id, a UUID).
 */
export interface WorksheetView extends Omit<WorksheetDto, 'id'> {
  id: number | string
}
