import { specificationChargeTarget } from '../../shared/utils/specification-target'
import type { SpecificationDto } from '../../shared/types/registers'
import { api, DEMO_PASSWORD } from './api'

export const AMBIENT = { elevation: { value: 420, unit: 'ft' } } as const
export const GAS_TEMPERATURE = { value: 15, unit: 'C' } as const

export async function unitAt(cookie: string, registration: string, position: RegExp) {
  const units = (await api('/api/accumulators?installed=true&pageSize=500', { cookie })).body.items as {
    id: number
    position: string
    aircraft: { id: number, registration: string }
  }[]
  const unit = units.find(
    candidate => candidate.aircraft.registration === registration && position.test(candidate.position),
  )
  if (!unit) throw new Error(`No unit at ${registration} ${position}`)
  return unit
}

export async function toolId(cookie: string, assetNumber: string): Promise<number> {
  const tools = (await api('/api/tools?pageSize=500', { cookie })).body.items as { id: number, assetNumber: string }[]
  return tools.find(tool => tool.assetNumber === assetNumber)!.id
}

/**
 * The target the engine gives for a worksheet's frozen specification at the test's conditions: used to
 * choose readings in or out of limits, never as the value a test expects (those come from outside the
 * engine, e.g. tests/api/worksheets.test.ts).
 */
export function targetForReadings(
  specification: SpecificationDto | Omit<SpecificationDto, 'status'>,
  gasTemperature = GAS_TEMPERATURE,
) {
  return specificationChargeTarget(specification, gasTemperature, AMBIENT)
}

/** Takes a new worksheet through every step up to signing, with an as-found and as-left in limits. */
export async function fillWorksheet(
  cookie: string,
  accumulatorId: number,
  options: { action?: 'none' | 'charge' | 'vent', asFoundOffset?: number } = {},
) {
  const created = await api('/api/worksheets', {
    cookie,
    body: { accumulatorId, workOrder: `WO-TEST-${Date.now()}`, reason: 'scheduled' },
  })
  if (created.status !== 201) throw new Error(JSON.stringify(created.body))
  const id = created.body.id as number
  const step = async (body: object) => {
    const answer = await api(`/api/worksheets/${id}`, { method: 'PATCH', cookie, body })
    if (answer.status !== 200)
      throw new Error(`${JSON.stringify(body)} → ${answer.status} ${JSON.stringify(answer.body)}`)
    return answer.body
  }
  await step({
    step: 'preparation',
    systemDepressurised: true,
    aircraftSafe: true,
    eyeProtection: true,
    nitrogenOnly: true,
  })
  await step({ step: 'tools', gaugeId: await toolId(cookie, 'GA-0141'), cartId: await toolId(cookie, 'NC-07') })
  await step({
    step: 'conditions',
    gasTemperature: GAS_TEMPERATURE,
    temperatureMethod: 'ambient-shade',
    minutesSinceOperated: 90,
    ambient: AMBIENT,
  })
  const target = targetForReadings(created.body.content.specification).target
  const reading = {
    value: Math.round(target.value) + (options.asFoundOffset ?? 0),
    unit: target.unit,
    basis: target.basis,
  }
  const afterAsFound = await step({ step: 'asFound', reading })
  await step({ step: 'action', kind: options.action ?? 'none' })
  return { id, created: created.body, target, reading, afterAsFound, step }
}

export async function finishAndSign(cookie: string, flow: Awaited<ReturnType<typeof fillWorksheet>>) {
  await flow.step({ step: 'asLeft', reading: flow.reading, gasTemperature: GAS_TEMPERATURE })
  await flow.step({ step: 'finish', valveLeakCheck: true, capFitted: true, remarks: 'Checked in limits.' })
  return api(`/api/worksheets/${flow.id}/sign`, { cookie, body: { password: DEMO_PASSWORD, certify: true } })
}
