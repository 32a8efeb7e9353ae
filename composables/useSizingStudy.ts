import { toTypedSchema } from '@vee-validate/zod'
import { useForm } from 'vee-validate'
import type { InjectionKey } from 'vue'
import { convertPressure } from '#shared/gas/units'
import { studyFormSchema, toStudyForm, toStudyInput, type StudyForm, type StudyInput } from '#shared/schemas/study'
import type { UserPreferences } from '#shared/types/user'
import type { StudyDto } from '#shared/types/study'
import { usePreferencesStore } from '~~/stores/preferences'

/** A new study: a typical brake accumulator in the user's units, over a cold soak, a standard day and a hot day. */
function blankStudy(preferences: UserPreferences): StudyForm {
  const fahrenheit = preferences.temperatureUnit === 'F'
  return {
    name: '',
    specificationId: null,
    accumulatorType: 'bladder',
    pressureUnit: preferences.pressureUnit,
    basis: 'gauge',
    temperatureUnit: preferences.temperatureUnit,
    volumeUnit: preferences.volumeUnit,
    gasVolume: 60,
    precharge: 1000,
    prechargeTemperature: fahrenheit ? 70 : 21,
    maxPressure: 3000,
    minPressure: 1500,
    perApplication: 2.5,
    charge: 'isothermal',
    discharge: 'adiabatic',
    model: 'real',
    elevation: preferences.stationElevation.value,
    elevationUnit: preferences.stationElevation.unit,
    envelope: [
      { label: 'Cold soak', temperature: -40 },
      { label: 'Standard day', temperature: fahrenheit ? 59 : 15 },
      { label: 'Hot day', temperature: fahrenheit ? 122 : 50 },
    ],
    inverseApplications: undefined,
  }
}

/**
 * One sizing study's data: the saved study (or a new one in the user's units), the form over the shared schema,
 * the results for the inputs on screen (useStudyResults), saving and duplicating. The page provides it; its
 * sections take it with `useSizingStudyContext()`.
 */
export async function useSizingStudy(
  id: number | null,
  saved: { data: Ref<StudyDto | undefined>, error: Ref<unknown> } | null,
) {
  // The saved study is loaded by the page (the form starts from it); the specifications are awaited last, once
  // everything that needs the component (the form, provide) is set up.
  const current = useCurrentSpecifications()
  const { data: specifications } = current
  const canEdit = useAbility('study.edit')
  const preferencesStore = usePreferencesStore()
  const blank = blankStudy(preferencesStore.preferences)
  const savedStudy = computed(() => saved?.data.value ?? null)

  const form = useForm<StudyForm>({
    validationSchema: toTypedSchema(studyFormSchema),
    initialValues: savedStudy.value ? toStudyForm(savedStudy.value.inputs) : blank,
  })
  const { values, defineField, setFieldValue, validate, setErrors, resetForm } = form

  // Changing the pressure unit keeps the pressures: they are converted, not relabelled.
  watch(() => values.pressureUnit, (unit, previous) => {
    if (!unit || !previous || unit === previous) return
    for (const name of ['precharge', 'maxPressure', 'minPressure'] as const) {
      const value = values[name]
      if (typeof value === 'number')
        setFieldValue(name, Number(convertPressure({ value, unit: previous, basis: 'absolute' }, unit).value.toPrecision(6)))
    }
  })

  // A new study takes the user's units and station as soon as they are known.
  if (!savedStudy.value) {
    watch(() => preferencesStore.loaded, (loaded) => {
      if (!loaded) return
      const mine = blankStudy(preferencesStore.preferences)
      setFieldValue('pressureUnit', mine.pressureUnit)
      setFieldValue('volumeUnit', mine.volumeUnit)
      setFieldValue('elevation', mine.elevation)
      setFieldValue('elevationUnit', mine.elevationUnit)
      if (mine.temperatureUnit !== values.temperatureUnit) {
        setFieldValue('temperatureUnit', mine.temperatureUnit)
        setFieldValue('prechargeTemperature', mine.prechargeTemperature)
        setFieldValue('envelope', mine.envelope)
      }
    }, { immediate: true })
  }

  const field = <K extends keyof StudyForm>(name: K) => defineField(name)[0]
  const fields = {
    name: field('name'),
    gasVolume: field('gasVolume'),
    precharge: field('precharge'),
    prechargeTemperature: field('prechargeTemperature'),
    maxPressure: field('maxPressure'),
    minPressure: field('minPressure'),
    perApplication: field('perApplication'),
    inverseApplications: field('inverseApplications'),
    elevation: field('elevation'),
    /** The polytropic exponent of each process, when it is "custom". */
    exponents: { charge: field('chargeExponent'), discharge: field('dischargeExponent') },
  }

  /** Linking a specification fills in its figures (converted into the study's pressure unit). */
  function linkSpecification(specificationId: number | null) {
    const specification = specifications.value?.find(candidate => candidate.id === specificationId)
    setFieldValue('specificationId', specification?.id ?? null)
    if (!specification) return
    const inUnit = (value: number) => Math.round(convertPressure(
      { value, unit: specification.pressureUnit, basis: specification.pressureBasis }, values.pressureUnit!,
    ).value * 100) / 100
    setFieldValue('accumulatorType', specification.accumulatorType)
    setFieldValue('basis', specification.pressureBasis)
    setFieldValue('precharge', inUnit(specification.referencePressure))
    setFieldValue('maxPressure', inUnit(specification.maxPressure))
    setFieldValue('minPressure', inUnit(specification.minPressure))
    if (specification.gasVolumeUnit === values.volumeUnit) setFieldValue('gasVolume', specification.gasVolume)
    if (specification.referenceTemperatureUnit === values.temperatureUnit)
      setFieldValue('prechargeTemperature', specification.referenceTemperature)
    if (!values.name) setFieldValue('name', `${specification.partNumber} rev ${specification.revision}`)
  }

  function addTemperature() {
    const envelope = values.envelope ?? []
    setFieldValue('envelope', [...envelope, { label: `Condition ${envelope.length + 1}`, temperature: 0 }])
  }
  function removeTemperature(index: number) {
    setFieldValue('envelope', (values.envelope ?? []).filter((_, at) => at !== index))
  }

  const input = computed<StudyInput | null>(() => {
    const parsed = studyFormSchema.safeParse({ ...values, name: values.name || 'Unsaved study' })
    return parsed.success ? toStudyInput(parsed.data) : null
  })
  const { results, computeError } = useStudyResults(input)

  const saving = ref(false)
  const saveMessage = ref<{ text: string, failed: boolean } | null>(null)
  async function save() {
    const check = await validate()
    if (!check.valid || !input.value) {
      saveMessage.value = { text: 'Some fields need a look before saving.', failed: true }
      return
    }
    saving.value = true
    saveMessage.value = null
    try {
      const body = toStudyInput(studyFormSchema.parse(values))
      const study = id
        ? await $fetch<StudyDto>(`/api/studies/${id}`, { method: 'PATCH', body })
        : await $fetch<StudyDto>('/api/studies', { method: 'POST', body })
      saveMessage.value = { text: 'Study saved.', failed: false }
      // What was saved is the new starting point: leaving now loses nothing.
      resetForm({ values: structuredClone(toRaw(values)) })
      if (!id) await navigateTo(`/sizing/${study.id}`)
    }
    catch (failure) {
      setErrors(fieldErrors(failure))
      saveMessage.value = { text: errorMessage(failure), failed: true }
    }
    finally {
      saving.value = false
    }
  }
  async function duplicate() {
    const copy = await $fetch<StudyDto>(`/api/studies/${id}/duplicate`, { method: 'POST' })
    await navigateTo(`/sizing/${copy.id}`)
  }

  const study = {
    id, saved: savedStudy, loadError: saved?.error ?? ref(null), specifications, canEdit,
    values, errors: form.errors, meta: form.meta, setFieldValue, fields,
    linkSpecification, addTemperature, removeTemperature,
    input, results, computeError, saving, saveMessage, save, duplicate,
  }
  provide(sizingStudyKey, study)
  await current
  return study
}

export type SizingStudy = Awaited<ReturnType<typeof useSizingStudy>>
const sizingStudyKey: InjectionKey<SizingStudy> = Symbol('sizing-study')

/** The sizing study's data, in one of the page's sections. */
export function useSizingStudyContext(): SizingStudy {
  const study = inject(sizingStudyKey)
  if (!study) throw new Error('A sizing section is used outside the sizing study page.')
  return study
}
