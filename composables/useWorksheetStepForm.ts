import type { InjectionKey } from 'vue'
import { toTypedSchema } from '@vee-validate/zod'
import { useForm } from 'vee-validate'
import type { ZodType, ZodTypeDef } from 'zod'
import type { WorksheetStepBody } from '#shared/schemas/worksheet'
import type { WorksheetView } from '#shared/types/worksheet'
import type { Pressure, Temperature } from '#shared/gas/types'
import { assessWorksheetReading, type AssessmentSummary } from '#shared/utils/worksheet-results'
import { useDeviceQueueStore } from '~~/stores/device-queue'

export type StepSaveStatus = 'idle' | 'saving' | 'saved' | 'queued' | 'error'

/**
 * How the steps hand the worksheet back to the steps view (WorksheetSteps), which provides it.
 * Not emitted events: a save or an upload can land after the technician has moved to another
 * step, when the step's component is gone and Vue drops its events, and the record on screen
 * would miss it.
 */
export interface WorksheetStepsContext {
  /** A step was saved: the record on screen takes it, and the view moves on if that step is still open. */
  stepSaved: (step: WorksheetStepBody['step'], worksheet: WorksheetView) => void
  /** The worksheet changed without a step being saved (a photo added, replaced or removed). */
  changed: (worksheet: WorksheetView) => void
}
export const worksheetStepsKey: InjectionKey<WorksheetStepsContext> = Symbol('worksheet-steps')

export function useWorksheetSteps(): WorksheetStepsContext {
  const context = inject(worksheetStepsKey, null)
  if (!context) throw new Error('A worksheet step is shown outside WorksheetSteps.')
  return context
}

/**
 * Saves one step to the server, or keeps it on the device with no connection, and hands the
 * saved worksheet to the steps view. Answers what to tell the technician: the queued notice, or
 * null once the server has it.
 */
export function useWorksheetStepSave(worksheetId: number | string) {
  const drafts = useDeviceQueueStore()
  const steps = useWorksheetSteps()
  return async (body: WorksheetStepBody): Promise<string | null> => {
    const { worksheet, queued } = await drafts.saveStep(worksheetId, body)
    if (queued) return 'No connection: saved on this device, and sent as soon as the connection returns.'
    steps.stepSaved(body.step, worksheet!)
    return null
  }
}

/**
 * One worksheet step's form: validated with the step's shared schema, every keystroke kept in
 * the draft store (so a reload restores it), saved to the server on submit or queued offline.
 */
export function useWorksheetStepForm<Body extends WorksheetStepBody>(
  worksheetId: number | string,
  schema: ZodType<Body, ZodTypeDef, unknown>,
  initialValues: () => Partial<Body>,
) {
  const drafts = useDeviceQueueStore()
  const saveStep = useWorksheetStepSave(worksheetId)
  const step = (initialValues() as { step: Body['step'] }).step
  const form = useForm({
    validationSchema: toTypedSchema(schema),
    initialValues: { ...initialValues(), ...(drafts.draftFor(worksheetId, step) ?? {}) } as never,
  })
  watch(form.values, values => drafts.remember(worksheetId, step, values as Record<string, unknown>), { deep: true })
  const status = ref<StepSaveStatus>('idle')
  const message = ref<string | null>(null)
  /** A confirmation the server asks for before it takes this step (e.g. `confirmedUnchanged`). */
  const confirmation = ref<string | null>(null)

  const save = form.handleSubmit(async (body) => {
    status.value = 'saving'
    message.value = null
    confirmation.value = null
    try {
      message.value = await saveStep(body as WorksheetStepBody)
      status.value = message.value ? 'queued' : 'saved'
    }
    catch (failure) {
      status.value = 'error'
      form.setErrors(fieldErrors(failure))
      message.value = errorMessage(failure)
      confirmation.value = (failure as { data?: { data?: { confirm?: string } } })?.data?.data?.confirm ?? null
    }
  })

  /** Clears a refusal that no longer holds (the settle time has run out since the server refused). */
  function clearRefusal() {
    if (status.value !== 'error') return
    status.value = 'idle'
    message.value = null
    form.setErrors(Object.fromEntries(Object.keys(form.errors.value).map(path => [path, undefined])))
  }

  return { ...form, save, status, message, confirmation, clearRefusal }
}

/**
 * The figure for a reading as it is typed, worked out on this device by the shared engine from the worksheet's
 * frozen specification, conditions and gauge — the same computation the server runs when the step is saved
 * (and the server's answer is what the record keeps). Null while the inputs give no figure.
 */
export function useReadingPreview(
  worksheet: () => WorksheetView,
  reading: () => Pressure | undefined,
  gasTemperature: () => Temperature | undefined,
) {
  return computed<AssessmentSummary | null>(() => {
    const { content } = worksheet()
    const typed = reading()
    const temperature = gasTemperature()
    const usable = (value: number | undefined) => typeof value === 'number' && Number.isFinite(value)
    if (!content.conditions || !typed || !usable(typed.value) || !temperature || !usable(temperature.value)) return null
    try {
      const { specification, conditions, tools } = content
      return assessWorksheetReading(specification, typed, temperature, conditions.ambient, tools?.gauge)
    }
    catch {
      return null
    }
  })
}
