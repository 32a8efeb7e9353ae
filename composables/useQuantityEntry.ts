import { getStationLocale } from '#shared/gas/format'
import type { PressureBasis } from '#shared/gas/types'
import {
  convertEntry, entryValue, formatEntry, parseEntry, rangeProblem,
  type QuantityKind, type QuantityLimit, type QuantityUnit,
} from '#shared/utils/quantity-entry'

export interface QuantityEntryOptions {
  kind: MaybeRefOrGetter<QuantityKind>
  unit: MaybeRefOrGetter<QuantityUnit>
  basis?: MaybeRefOrGetter<PressureBasis | undefined>
  min?: MaybeRefOrGetter<QuantityLimit | undefined>
  max?: MaybeRefOrGetter<QuantityLimit | undefined>
  decimals?: MaybeRefOrGetter<number | undefined>
  /** Empty is `null` (a figure that can be cleared) instead of `undefined` (not given). */
  nullable?: MaybeRefOrGetter<boolean | undefined>
}

/** The locale a person types in: the browser's, on the server the station's (nothing is typed there). */
function typingLocale(): string {
  return import.meta.client && typeof navigator !== 'undefined' ? navigator.language : getStationLocale()
}

/**
 * The state behind one quantity field (UiQuantityInput): the text as typed, the number it holds
 * (`undefined` when empty, NaN while what is typed is not a usable value, so a form computes nothing
 * from it), and the problem to show on the field. When the unit changes with the number unchanged,
 * the number is converted — the physical quantity stays, the figure on screen follows the unit.
 */
export function useQuantityEntry(model: Ref<number | null | undefined>, options: QuantityEntryOptions) {
  const kind = computed(() => toValue(options.kind))
  const unit = computed(() => toValue(options.unit))
  const format = (value: number | undefined, inUnit = unit.value) =>
    formatEntry(value, kind.value, inUnit, getStationLocale(), toValue(options.decimals))
  const text = ref(format(model.value ?? undefined))
  const problem = ref<string | null>(null)
  /** What this field last gave the form: a change of the model to anything else came from outside. */
  let given: number | null | undefined = model.value

  function give(value: number | undefined) {
    const held = value === undefined && toValue(options.nullable) ? null : value
    given = held
    model.value = held
  }

  function check(value: number): string | null {
    const limits = { min: toValue(options.min), max: toValue(options.max) }
    return rangeProblem(value, kind.value, unit.value, getStationLocale(), limits, toValue(options.basis))
  }

  /** Reads what was typed: empty is empty, never zero. */
  function accept(typed: string) {
    text.value = typed
    const parsed = parseEntry(typed, typingLocale())
    if (parsed.state === 'empty') {
      problem.value = null
      give(undefined)
      return
    }
    if (parsed.state === 'invalid') {
      problem.value = parsed.message
      give(Number.NaN)
      return
    }
    problem.value = check(parsed.value)
    give(problem.value ? Number.NaN : parsed.value)
  }

  /** ± for keypads without a minus key. */
  function flipSign() {
    const current = text.value.trim()
    accept(current.startsWith('-') || current.startsWith('−') ? current.slice(1) : `-${current || '0'}`)
  }

  // One watcher for the number and the unit, so a form that sets both at once (a saved preference) is
  // taken as it is, while a unit changed alone converts the number.
  const sources = [model, unit, () => toValue(options.min), () => toValue(options.max)] as const
  watch(sources, ([value, next, min, max], [, previous, oldMin, oldMax]) => {
    if (!Object.is(value, given)) {
      given = value
      if (value === undefined || value === null || Number.isFinite(value)) {
        text.value = format(value ?? undefined)
        problem.value = value === undefined || value === null ? null : check(value)
        // The form holds what the field shows, so every figure is one for the inputs on screen.
        if (typeof value === 'number') {
          const shown = entryValue(value, kind.value, next, toValue(options.decimals))
          if (shown !== value) give(shown)
        }
      }
      return
    }
    if (next !== previous && typeof value === 'number' && Number.isFinite(value)) {
      const converted = entryValue(
        convertEntry(value, kind.value, previous, next), kind.value, next, toValue(options.decimals))
      if (!Number.isFinite(converted)) {
        text.value = ''
        give(undefined)
        return
      }
      text.value = format(converted, next)
      problem.value = check(converted)
      give(problem.value ? Number.NaN : converted)
      return
    }
    // The unit changed under a value that did not parse or was out of range, or the limits changed: read it again.
    if (next !== previous || JSON.stringify([min, max]) !== JSON.stringify([oldMin, oldMax])) accept(text.value)
  })

  return { text, problem, accept, flipSign }
}
