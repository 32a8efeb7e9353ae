import { toTypedSchema } from '@vee-validate/zod'
import { useForm } from 'vee-validate'
import type { InjectionKey } from 'vue'
import type { CorrectionCurveInput } from '#shared/gas/charge-target'
import { formatPressureValue, pressureUnitLabel } from '#shared/gas/format'
import { GAS_TEMPERATURE_RANGE_C } from '#shared/schemas/quantities'
import type { Ambient, PressureUnit, Temperature } from '#shared/gas/types'
import { convertTemperature, stationPressureFromHectopascals } from '#shared/gas/units'
import { chargeTargetFormSchema, type ChargeTargetForm } from '#shared/schemas/charge-target-form'
import type { InstalledUnitDto } from '#shared/types/fleet'
import type { SpecificationDto } from '#shared/types/registers'
import { SYSTEM_PRESSURE } from '#shared/utils/quantity-entry'
import { specificationTargetRequest } from '#shared/utils/specification-target'
import { useFieldReferenceStore } from '~~/stores/field-reference'
import { usePreferencesStore } from '~~/stores/preferences'
import type { ChargeTargetRequest } from '#shared/utils/charge-target-answer'

/** Gas temperatures a unit is serviced at, in any unit (the field converts and words the limit). */
export const GAS_TEMPERATURE_LIMITS = {
  min: { value: GAS_TEMPERATURE_RANGE_C.min, unit: 'C', reason: 'the coldest gas temperature serviced' },
  max: { value: GAS_TEMPERATURE_RANGE_C.max, unit: 'C', reason: 'the hottest gas temperature serviced' },
} as const
/** No charging gauge reads beyond 10000 psi (common practice, no source): a figure above is a slip or a wrong unit. */
export const GAUGE_CEILING = { value: 10000, unit: 'psi', reason: 'any charging gauge' } as const

const FIELD_NAMES = [
  'source', 'accumulatorId', 'specificationId', 'referencePressure', 'referenceBasis', 'referenceTemperature',
  'toleranceMinus', 'tolerancePlus', 'toleranceUnit', 'model', 'gasTemperature', 'ambientMode', 'elevation',
  'elevationUnit', 'stationPressureHpa', 'asFound', 'pressureUnit',
] as const
type FieldRefs = { [K in (typeof FIELD_NAMES)[number]]: Ref<ChargeTargetForm[K]> }

/**
 * The gas temperature first offered: a standard day (15 °C, the standard atmosphere's sea-level temperature) in
 * the user's unit.
 */
const standardDay = (unit: 'C' | 'F') => Number(convertTemperature({ value: 15, unit: 'C' }, unit).value.toFixed(1))
const temperatureIn = (celsius: number, unit: 'C' | 'F'): Temperature => convertTemperature({ value: celsius, unit: 'C' }, unit)

/** A gas-law target's plotted curves, real and ideal, over the serviced range. */
function curvesFor(
  { reference, tolerance }: Pick<CorrectionCurveInput, 'reference' | 'tolerance'>,
  ambient: Ambient,
  unit: 'C' | 'F',
): { real: CorrectionCurveInput, ideal: CorrectionCurveInput } {
  const range = { reference, tolerance, ambient, from: temperatureIn(-55, unit), to: temperatureIn(70, unit) }
  return { real: { ...range, model: 'real' }, ideal: { ...range, model: 'ideal' } }
}

/**
 * The Charge target page's data: the form (vee-validate with the shared schema, the user's units followed until a
 * field is changed), the unit or specification it is for, the request it makes of the engine, and the figures
 * answered for it (useChargeTarget: never an answer for other inputs). The page provides it; its sections
 * take it with `useChargeTargetPageContext()`.
 */
export async function useChargeTargetPage() {
  // Asked for first, awaited last: everything that needs the component (the form, provide) is set up before the await.
  const station = useStationUnits()
  const { installed, status: unitsStatus, units, error: unitsError, asOf: deviceCopyAsOf } = station
  const current = useCurrentSpecifications()
  const { status: specificationsStatus } = current
  // With no signal, the specifications as this device holds them.
  const device = useFieldReferenceStore()
  const specifications = computed(() => current.data.value ?? device.reference?.specifications)
  const store = usePreferencesStore()
  const preferences = computed(() => store.preferences)
  const temperatureUnit = computed(() => preferences.value.temperatureUnit)

  const { values, errors, defineField, setFieldValue, isFieldDirty } = useForm<ChargeTargetForm>({
    validationSchema: toTypedSchema(chargeTargetFormSchema),
    initialValues: {
      source: 'unit',
      referenceBasis: 'gauge',
      toleranceUnit: 'unit',
      model: 'real',
      gasTemperature: standardDay(preferences.value.temperatureUnit),
      ambientMode: 'elevation',
      elevation: preferences.value.stationElevation.value,
      elevationUnit: preferences.value.stationElevation.unit,
      pressureUnit: preferences.value.pressureUnit,
    },
  })
  const fields = Object.fromEntries(FIELD_NAMES.map(name => [name, defineField(name)[0]])) as FieldRefs

  // The user's saved units arrive after the page may have rendered: follow them until the user changes a field.
  watch(() => store.loaded, (loaded) => {
    if (!loaded) return
    setFieldValue('pressureUnit', preferences.value.pressureUnit)
    setFieldValue('elevation', preferences.value.stationElevation.value)
    setFieldValue('elevationUnit', preferences.value.stationElevation.unit)
    if (!isFieldDirty('gasTemperature')) setFieldValue('gasTemperature', standardDay(preferences.value.temperatureUnit))
  }, { immediate: true })

  // The picker gives back the unit it found, also when the register search found it beyond the page's list.
  const pickedUnit = ref<InstalledUnitDto>()
  const selectedUnit = computed(() => (units.value ?? []).find(unit => unit.id === values.accumulatorId)
    ?? (pickedUnit.value?.id === values.accumulatorId ? pickedUnit.value : undefined))
  const specification = computed<SpecificationDto | undefined>(() => {
    const id = values.source === 'unit'
      ? selectedUnit.value?.specificationId
      : values.source === 'specification' ? values.specificationId : undefined
    return (specifications.value ?? []).find(candidate => candidate.id === id)
  })

  const request = computed<ChargeTargetRequest | null>(() => {
    const parsed = chargeTargetFormSchema.safeParse(values)
    if (!parsed.success) return null
    const form = parsed.data
    const unit: PressureUnit = form.pressureUnit
    const gasTemperature: Temperature = { value: form.gasTemperature, unit: temperatureUnit.value }
    const ambient: Ambient = form.ambientMode === 'barometer' && form.stationPressureHpa !== undefined
      ? { pressure: stationPressureFromHectopascals(form.stationPressureHpa) }
      : { elevation: { value: form.elevation, unit: form.elevationUnit } }
    if (form.source === 'manual') {
      const reference = {
        pressure: { value: form.referencePressure!, unit, basis: form.referenceBasis },
        temperature: { value: form.referenceTemperature!, unit: temperatureUnit.value },
      }
      const tolerance = {
        minus: form.toleranceMinus ?? 0,
        plus: form.tolerancePlus ?? 0,
        unit: form.toleranceUnit === '%' ? ('%' as const) : unit,
      }
      const body = { reference, gasTemperature, ambient, model: form.model, tolerance }
      return {
        target: { route: 'charge-target', body },
        curves: curvesFor(body, ambient, temperatureUnit.value),
        asFound: form.asFound !== undefined ? { value: form.asFound, unit, basis: form.referenceBasis } : undefined,
      }
    }
    if (!specification.value) return null
    const target = specificationTargetRequest(specification.value, gasTemperature, ambient, unit)
    const basis = specification.value.pressureBasis
    return {
      target,
      curves: target.route === 'charge-target' ? curvesFor(target.body, ambient, temperatureUnit.value) : undefined,
      asFound: form.asFound !== undefined ? { value: form.asFound, unit, basis } : undefined,
    }
  })

  const figures = useChargeTarget(request)
  /** A refusal from the engine, shown under the input it names. */
  const refusalFor = (field: string) => {
    const named = figures.errorField.value
    return named && (named === field || named.startsWith(`${field}.`)) ? figures.error.value : null
  }
  const hasInputErrors = computed(() => Object.values(errors.value).some(Boolean))

  /** One degree warmer or colder, from the figure shown (or a standard day when the field is empty). */
  function stepGasTemperature(amount: number) {
    const now = Number.isFinite(values.gasTemperature) ? values.gasTemperature : standardDay(temperatureUnit.value)
    setFieldValue('gasTemperature', Math.round((now + amount) * 10) / 10)
  }

  /** The unit's maximum working pressure: above it the gauge reads system pressure, not the pre-charge. */
  const asFoundCeiling = computed(() => specification.value
    ? {
        value: specification.value.maxPressure,
        unit: specification.value.pressureUnit,
        reason: 'the unit\'s maximum working pressure',
        advice: SYSTEM_PRESSURE,
      }
    : GAUGE_CEILING)

  /** The unit and words the figures are shown in, and the gas temperature they are for (the answered request's). */
  const pressureUnit = computed<PressureUnit>(() => figures.target.value?.target.unit ?? values.pressureUnit ?? 'psi')
  const pressureLabel = computed(() =>
    pressureUnitLabel(pressureUnit.value, figures.target.value?.target.basis ?? values.referenceBasis ?? 'gauge'))
  const showPressure = (value: number) => formatPressureValue(value, pressureUnit.value)
  const answeredTemperature = computed(() => figures.answered.value?.target.body.gasTemperature.value)

  const page = {
    units, unitsStatus, unitsError, deviceCopyAsOf, specifications, specificationsStatus, temperatureUnit,
    values, errors, fields, setFieldValue, pickedUnit, selectedUnit, specification,
    request, ...figures, refusalFor, hasInputErrors, stepGasTemperature, asFoundCeiling,
    pressureUnit, pressureLabel, showPressure, answeredTemperature,
  }
  provide(chargeTargetPageKey, page)
  await Promise.all([installed, current])
  return page
}

export type ChargeTargetPage = Awaited<ReturnType<typeof useChargeTargetPage>>
const chargeTargetPageKey: InjectionKey<ChargeTargetPage> = Symbol('charge-target-page')

/** The Charge target page's data, in one of its sections. */
export function useChargeTargetPageContext(): ChargeTargetPage {
  const page = inject(chargeTargetPageKey)
  if (!page) throw new Error('A Charge target section is used outside the Charge target page.')
  return page
}
