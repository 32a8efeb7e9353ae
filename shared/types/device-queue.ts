import type { Pressure } from '../gas/types'
import type { WorksheetCreateBody, WorksheetStepBody } from '../schemas/worksheet'
import type { WorksheetContent, WorksheetResults } from './worksheet'

type StepName = WorksheetStepBody['step']

/** A worksheet started on this device with no signal, kept here until the server has it. */
export interface LocalWorksheet {
  clientId: string
  performer: { id: number, name: string }
  accumulatorId: number
  specificationId: number
  workOrder: string
  reason: WorksheetCreateBody['reason']
  correctsId?: number
  startedAt: string
  /** Every step as taken, with the device's time: the server replays them in order. */
  steps: { at: string, body: WorksheetStepBody }[]
  content: WorksheetContent
  results: WorksheetResults
  /** The server refused the whole worksheet (the unit no longer installed …): why, for the technician. */
  failure?: string
}

/** A worksheet the server now holds, and what it could not accept as the device had it. */
export interface SentWorksheet {
  clientId: string
  worksheetId: number
  conflicts: string[]
  sentAt: string
  label: string
}

/** A step taken here that the server refused when sent: what it was, when it was taken, and the server's reason. */
export interface RefusedStep {
  worksheetId: number
  userId: number
  body: WorksheetStepBody
  queuedAt: string
  refusedAt: string
  reason: string
}

/**
 * A gauge photo taken on this device, waiting to be sent: its file is kept in IndexedDB under `blobKey`
 * (the queue itself is JSON). `worksheet` is the server's id, or the device's id of a worksheet started here.
 */
export interface QueuedPhoto {
  id: string
  worksheet: number | string
  userId: number
  name: string
  type: string
  takenAt: string
  blobKey: string
  replacesId?: number
  /** The server refused it: why, kept until the technician has read it. */
  failure?: string
}

export interface DeviceQueue {
  /** What the user has typed into each step's form, saved or not, per worksheet (id or client id). */
  values: Record<string, Partial<Record<StepName, Record<string, unknown>>>>
  /** Steps of server worksheets taken offline, oldest first, with the device's time. */
  pending: { worksheetId: number, userId: number, body: WorksheetStepBody, queuedAt: string }[]
  local: Record<string, LocalWorksheet>
  sent: SentWorksheet[]
  /** Readings taken while the gas settles, for the forecast (advice, kept on the device). */
  settle: Record<string, { at: string, pressure: Pressure }[]>
  /** Steps taken here that the server refused when sent: kept, with why, until the technician has seen them. */
  refused: RefusedStep[]
  /** Photos taken here, waiting to be sent. */
  photos: QueuedPhoto[]
  /** Counts the service worker's sends: a page holding another count takes the queue from IndexedDB first. */
  workerRevision?: number
}

export const EMPTY_DEVICE_QUEUE: DeviceQueue = {
  values: {}, pending: [], local: {}, sent: [], settle: {}, refused: [], photos: [],
}
/** Where the queue lives in IndexedDB (idb-keyval's default store); the key keeps its first name. */
export const DEVICE_QUEUE_KEY = 'chargewell:field-work'
/** The tag of the background sync that sends the queue when the connection returns. */
export const DEVICE_QUEUE_SYNC_TAG = 'chargewell-send-queue'
/** The Web Lock held while the queue is sent: by a page or by the service worker, never both at once. */
export const DEVICE_QUEUE_LOCK = 'chargewell-send-queue'
