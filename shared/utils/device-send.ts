import type { SyncAnswer } from '../types/field'
import type { DeviceQueue, SentWorksheet } from '../types/device-queue'

/**
 * Sends what waits on a device, in order — steps of server worksheets (with the time each was taken),
 * whole worksheets started here, then photos — for one signed-in user. Written once and run by the page
 * (stores/device-queue.ts) and by the service worker when the connection returns with the app closed.
 * Works on the queue it is given (changing it as each item is sent) and stops at the first request that
 * gets no answer; a refusal is kept with its reason, never dropped.
 */

/** A request's failure as the app's fetch gives it: no `statusCode` when nothing answered. */
export interface SendFailure {
  statusCode?: number
  message?: string
  data?: { message?: string, data?: Record<string, unknown> }
}

export interface Sender {
  /** JSON request; rejects with a SendFailure. */
  json: <T>(path: string, init: { method: string, body: unknown, headers?: Record<string, string> }) => Promise<T>
  /** Multipart upload; rejects with a SendFailure. */
  form: (path: string, form: FormData) => Promise<unknown>
  /** A kept photo's file, or null when the device no longer has it. */
  photo: (blobKey: string) => Promise<Blob | null>
  dropPhoto: (blobKey: string) => Promise<void>
  /** Called after each change to the queue, to keep it (IndexedDB) as it now is. */
  save: (queue: DeviceQueue) => Promise<void> | void
  now?: () => string
}

export const noAnswer = (failure: unknown) => (failure as SendFailure)?.statusCode === undefined

/** The server's reason for a refusal, in its words. */
export function refusalText(failure: unknown): string {
  const error = failure as SendFailure
  return error?.data?.message ?? error?.message ?? 'Refused by Chargewell.'
}

/** The server kept a refused step on the record as observed (a step this device took with no signal). */
export function keptAsObservation(failure: unknown): boolean {
  return (failure as SendFailure)?.data?.data?.keptAsObservation === true
}

/** Sends the user's queue; answers the worksheets sent now. */
export async function sendDeviceQueue(queue: DeviceQueue, userId: number, sender: Sender): Promise<SentWorksheet[]> {
  const now = sender.now ?? (() => new Date().toISOString())
  const sentNow: SentWorksheet[] = []
  for (;;) {
    const next = queue.pending.find(entry => entry.userId === userId)
    if (!next) break
    try {
      await sender.json(`/api/worksheets/${next.worksheetId}`, {
        method: 'PATCH',
        body: next.body,
        headers: { 'x-taken-at': next.queuedAt },
      })
    }
    catch (failure) {
      if (noAnswer(failure)) return sentNow
      queue.refused = [...queue.refused, {
        ...structuredClone(next),
        refusedAt: now(),
        reason: refusalText(failure) + (keptAsObservation(failure)
          ? ' What you entered is kept on the worksheet as observed, with its time; redo the step.'
          : ''),
      }]
    }
    queue.pending = queue.pending.filter(entry => entry !== next)
    await sender.save(queue)
  }
  const locals = Object.values(queue.local).filter(candidate => candidate.performer.id === userId && !candidate.failure)
  for (const local of locals) {
    try {
      const { clientId, performer: _who, content: _content, results: _results, failure: _failure, ...body } = local
      const answer = await sender.json<SyncAnswer>('/api/worksheets/sync', {
        method: 'POST',
        body: { clientId, ...body },
      })
      const sent: SentWorksheet = {
        clientId,
        worksheetId: answer.worksheet.id,
        conflicts: answer.conflicts,
        sentAt: now(),
        label: `${local.content.aircraft.registration} · ${local.content.accumulator.position} · ${local.workOrder}`,
      }
      queue.sent = [sent, ...queue.sent.filter(entry => entry.clientId !== clientId)].slice(0, 20)
      queue.values[answer.worksheet.id] = queue.values[clientId] ?? {}
      if (queue.settle[clientId]) queue.settle[answer.worksheet.id] = queue.settle[clientId]!
      queue.local = Object.fromEntries(Object.entries(queue.local).filter(([key]) => key !== clientId))
      queue.values = Object.fromEntries(Object.entries(queue.values).filter(([key]) => key !== clientId))
      queue.settle = Object.fromEntries(Object.entries(queue.settle).filter(([key]) => key !== clientId))
      // Photos of the worksheet now go to the server's record.
      queue.photos = queue.photos.map(photo =>
        (photo.worksheet === clientId ? { ...photo, worksheet: answer.worksheet.id } : photo))
      sentNow.push(sent)
    }
    catch (failure) {
      if (noAnswer(failure)) return sentNow
      local.failure = refusalText(failure)
    }
    await sender.save(queue)
  }
  for (const photo of queue.photos.filter(candidate => candidate.userId === userId && !candidate.failure)) {
    // A photo of a worksheet still on this device waits for it.
    if (typeof photo.worksheet !== 'number') continue
    const file = await sender.photo(photo.blobKey)
    if (file) {
      const form = new FormData()
      form.append('worksheetId', String(photo.worksheet))
      form.append('kind', 'gauge-photo')
      if (photo.replacesId) form.append('replacesId', String(photo.replacesId))
      form.append('fileName', photo.name)
      form.append('file', new File([file], photo.name, { type: photo.type }))
      try {
        await sender.form('/api/attachments', form)
      }
      catch (failure) {
        if (noAnswer(failure)) return sentNow
        queue.photos = queue.photos.map(candidate =>
          (candidate.id === photo.id ? { ...candidate, failure: refusalText(failure) } : candidate))
        await sender.save(queue)
        continue
      }
    }
    queue.photos = queue.photos.filter(candidate => candidate.id !== photo.id)
    await sender.save(queue)
    await sender.dropPhoto(photo.blobKey)
  }
  return sentNow
}
