import { mountSuspended } from '@nuxt/test-utils/runtime'
import { describe, expect, it } from 'vitest'
import { nextTick } from 'vue'
import type { InstalledUnitDto } from '#shared/types/fleet'
import FleetUnitPicker from '~~/components/fleet/FleetUnitPicker.vue'

/**
 * The aircraft-then-position picker (components/fleet/FleetUnitPicker.vue). New worksheet shows the device's copy
 * of the station's units at once and the register's list when it arrives: an aircraft picked in between must
 * stay picked (on a busy machine the browser test picked one and waited 30 s for positions that the arriving
 * list had wiped), and a unit chosen before its list arrived shows on its aircraft once it does.
 */

const aircraft = (id: number, registration: string) =>
  ({ id, registration, fleetNumber: String(400 + id), type: 'Tarnwing 46', base: 'EKR' })
const unit = (id: number, on: ReturnType<typeof aircraft>, position: string): InstalledUnitDto => ({
  id, partNumber: 'FA-2240-01', serialNumber: `SN-${id}`, position, system: 'Brake system', installedAt: null,
  aircraft: on, specificationId: 2, alerts: [],
})
const FMA = aircraft(1, 'QX-FMA')
const FMB = aircraft(2, 'QX-FMB')
const FMC = aircraft(3, 'QX-FMC')
/** The device's copy: its station's units. */
const STATION = [unit(11, FMA, 'Normal brake, nose bay'), unit(21, FMB, 'Normal brake, nose bay')]
/** The register's answer: every installed unit. */
const REGISTER = [...STATION, unit(22, FMB, 'Emergency brake, nose bay'), unit(31, FMC, 'Normal brake, nose bay')]

async function mountPicker(units: InstalledUnitDto[], modelValue?: number) {
  const picker = await mountSuspended(FleetUnitPicker, {
    props: {
      'units': units,
      'modelValue': modelValue,
      'onUpdate:modelValue': (value: number | undefined) => void picker.setProps({ modelValue: value }),
    },
  })
  const button = (name: string) => picker.findAll('button').find(candidate => candidate.text().startsWith(name))
  const positions = () => picker.findAll('fieldset').at(1)?.findAll('button').map(candidate => candidate.text()) ?? []
  return { picker, button, positions }
}

describe('the unit picker', () => {
  it('keeps an aircraft picked from the device’s copy when the register’s list arrives', async () => {
    const { picker, button, positions } = await mountPicker(STATION)
    await button('QX-FMB')!.trigger('click')
    expect(positions()).toEqual([expect.stringMatching(/^Normal brake, nose bay/)])
    await picker.setProps({ units: REGISTER })
    await nextTick()
    expect(button('QX-FMB')!.attributes('aria-pressed')).toBe('true')
    expect(positions()).toEqual([
      expect.stringMatching(/^Normal brake, nose bay/),
      expect.stringMatching(/^Emergency brake, nose bay/),
    ])
  })

  it('shows a unit chosen before its list arrived on its aircraft once it does', async () => {
    const { picker, button, positions } = await mountPicker([], 31)
    expect(picker.text()).toMatch(/No installed accumulators/)
    await picker.setProps({ units: REGISTER })
    await nextTick()
    expect(button('QX-FMC')!.attributes('aria-pressed')).toBe('true')
    expect(positions()).toEqual([expect.stringMatching(/^Normal brake, nose bay/)])
    expect(picker.emitted('update:unit')?.at(-1)).toEqual([REGISTER[3]])
  })
})
