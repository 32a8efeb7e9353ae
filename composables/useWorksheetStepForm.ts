import type { InjectionKey } from 'vue'
import { toTypedSchema } from '@vee-validate/zod'
import { useForm } from 'vee-validate'
import type { ZodType, ZodTypeDef } from 'zod'
import type { WorksheetStepBody } from '#shared/schemas/worksheet'
import type { WorksheetView } from '#shared/types/worksheet'
import { useFieldWorkStore } from '~~/stores/field-work'

export type StepSaveStatus = 'idle' | 'saving' | 'saved' | 'queued' | 'error'

/** Takes a step's saved worksheet: which step was saved, and the worksheet as the server now has it. */
export type StepSaved = (step: WorksheetStepBody['step'], worksheet: WorksheetView) => void
export const worksheetStepSavedKey: InjectionKey<StepSaved> = Symbol('worksheet-step-saved')

/**
 * Where a step hands its saved worksheet, provided by the steps view (WorksheetSteps). Not an
 * emitted event: a save can land after the technician has moved to another step, when the
 * step's component is gone and Vue drops its events, and the record on screen would miss it.
 */
export function useWorksheetStepSaved(): StepSaved {
  const saved = inject(worksheetStepSavedKey, null)
  if (!saved) throw new Error('A worksheet step is shown outside WorksheetSteps.')
  return saved
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
  const drafts = useFieldWorkStore()
  const stepSaved = useWorksheetStepSaved()
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
      const { worksheet, queued } = await drafts.saveStep(worksheetId, body as WorksheetStepBody)
      if (queued) {
        status.value = 'queued'
        message.value = 'No connection: saved on this device, and sent as soon as the connection returns.'
        return
      }
      status.value = 'saved'
      stepSaved(step, worksheet!)
    }
    catch (failure) {
      status.value = 'error'
      form.setErrors(fieldErrors(failure))
      message.value = errorMessage(failure)
      confirmation.value = (failure as { data?: { data?: { confirm?: string } } })?.data?.data?.confirm ?? null
    }
  })

  return { ...form, save, status, message, confirmation }
}
