import { mountSuspended } from '@nuxt/test-utils/runtime'
import { describe, expect, it } from 'vitest'
import { nextTick } from 'vue'
import UiQuantityInput from '~~/components/ui/UiQuantityInput.vue'

/**
 * The one quantity field (components/ui/UiQuantityInput.vue with composables/useQuantityEntry.ts), mounted in
 * the Nuxt runtime: a comma decimal is a decimal, empty is never zero, a unit switch converts the quantity
 * (never reinterprets the number on screen), and a figure out of range gives the form no number at all.
 */

async function mountField(props: Record<string, unknown> = {}) {
  const updates: unknown[] = []
  const field = await mountSuspended(UiQuantityInput, {
    props: {
      'id': 'precharge',
      'label': 'Pre-charge',
      'kind': 'pressure',
      'unit': 'psi',
      'basis': 'gauge',
      'modelValue': undefined,
      'onUpdate:modelValue': (value: number | null | undefined) => {
        updates.push(value)
        void field.setProps({ modelValue: value })
      },
      ...props,
    },
  })
  const input = field.find('input')
  const type = async (text: string) => {
    await input.setValue(text)
    await nextTick()
  }
  return { field, input, type, last: () => updates.at(-1), updates }
}

describe('the quantity field', () => {
  it('reads "1,5" and "1.5" alike as one and a half, never fifteen', async () => {
    const { type, last } = await mountField({ kind: 'pressure', unit: 'bar' })
    await type('1,5')
    expect(last()).toBe(1.5)
    await type('1.5')
    expect(last()).toBe(1.5)
  })

  it('refuses a number it could read two ways, and gives the form no number meanwhile', async () => {
    const { field, type, last } = await mountField()
    await type('1,500')
    expect(last()).toBeNaN()
    expect(field.text()).toMatch(/thousands separator/)
    await type('1500')
    expect(last()).toBe(1500)
    expect(field.find('[aria-invalid="true"]').exists()).toBe(false)
  })

  it('keeps empty as empty (undefined, or null where a figure can be cleared), never zero', async () => {
    const plain = await mountField()
    await plain.type('1500')
    await plain.type('')
    expect(plain.last()).toBeUndefined()
    const clearable = await mountField({ nullable: true })
    await clearable.type('12')
    await clearable.type('  ')
    expect(clearable.last()).toBeNull()
  })

  it('converts the quantity when the unit changes: 1500 psi becomes 103.42 bar, not 1500 bar', async () => {
    const { field, input, type, last } = await mountField()
    await type('1500')
    await field.setProps({ unit: 'bar' })
    await nextTick()
    // 1500 psi × 0.0689475729 bar/psi = 103.4214 bar (NIST SP 811 appendix B.8), shown to 2 decimals in bar.
    expect(last()).toBe(103.42)
    expect((input.element as HTMLInputElement).value).toBe('103.42')
    expect(field.text()).toContain('Pre-charge (bar gauge)')
  })

  it('takes a number set from outside as it is, in the unit on screen', async () => {
    const { field, input } = await mountField()
    await field.setProps({ modelValue: 1461.69 })
    await nextTick()
    expect((input.element as HTMLInputElement).value).toBe('1461.7')
  })

  it('says a figure is out of range in the unit on screen, and gives the form no number', async () => {
    const { field, type, last } = await mountField({ max: { value: 3000, unit: 'psi', reason: 'the maximum working pressure' } })
    await type('3100')
    expect(last()).toBeNaN()
    expect(field.text()).toMatch(/Above the maximum working pressure, 3000(\.0)? psi/)
    await field.setProps({ unit: 'bar' })
    await nextTick()
    // 3000 psi is 206.84 bar: the limit is said in bar, with the specification's own figure beside it.
    expect(field.text()).toMatch(/206\.84 bar gauge \(3000 psig\)/)
  })

  it('flips the sign with the ± key for keypads without a minus', async () => {
    const { field, type, last } = await mountField({ kind: 'temperature', unit: 'C', signed: true, basis: undefined })
    await type('12,5')
    await field.find('button').trigger('click')
    expect(last()).toBe(-12.5)
  })
})
