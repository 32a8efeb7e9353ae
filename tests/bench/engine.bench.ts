/**
 * `npm run bench`: median cost of the engine's hot paths in Node, printed, not asserted.
 * Goals (issue 3): ≤ 5 µs per real-gas charge target, ≤ 2 ms per 250-point correction curve.
 */
import { chargeTarget, correctionCurve } from '../../shared/gas/charge-target'
import { usableVolume } from '../../shared/gas/usable-volume'

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b)
  return sorted[Math.floor(sorted.length / 2)]!
}

/** Runs `work` in batches and returns the median microseconds per call. */
function measure(work: (index: number) => unknown, batch: number, batches = 41): number {
  for (let index = 0; index < batch * 3; index++) work(index) // warm up the JIT
  const perCall: number[] = []
  for (let round = 0; round < batches; round++) {
    const start = process.hrtime.bigint()
    for (let index = 0; index < batch; index++) work(index)
    perCall.push(Number(process.hrtime.bigint() - start) / 1000 / batch)
  }
  return median(perCall)
}

const reference = { pressure: { value: 1500, unit: 'psi' as const, basis: 'gauge' as const }, temperature: { value: 21, unit: 'C' as const } }
const tolerance = { minus: 50, plus: 50, unit: 'psi' as const }
let sink = 0

const target = measure(index => sink += chargeTarget({ reference, gasTemperature: { value: -40 + (index % 100), unit: 'C' } }).target.value, 2000)
const targetBand = measure(index => sink += chargeTarget({ reference, tolerance, gasTemperature: { value: -40 + (index % 100), unit: 'C' } }).target.value, 2000)
const usable = measure(index => sink += usableVolume({
  gasVolume: { value: 120, unit: 'in3' }, precharge: reference.pressure, prechargeTemperature: reference.temperature,
  operatingTemperature: { value: -40 + (index % 90), unit: 'C' }, maxPressure: { value: 3000, unit: 'psi', basis: 'gauge' },
  minPressure: { value: 1800, unit: 'psi', basis: 'gauge' }, perApplication: { value: 3, unit: 'in3' },
}).usableVolume.value, 200)
const curve = measure(index => sink += correctionCurve({ reference, tolerance, from: { value: -55 + (index % 3), unit: 'C' }, to: { value: 70, unit: 'C' }, points: 250 }).target[0]!, 20)

const row = (label: string, microseconds: number, goal?: string) => console.log(`${label.padEnd(52)} ${microseconds.toFixed(2).padStart(10)} µs${goal ? `   (goal ${goal})` : ''}`)
console.log(`Chargewell engine benchmark — Node ${process.version}, median of 41 batches\n`)
row('real-gas charge target', target, '≤ 5 µs')
row('real-gas charge target with tolerance band', targetBand)
row('real-gas usable volume (isentropic discharge, N apps)', usable)
row('250-point correction curve with band (real gas)', curve, '≤ 2000 µs')
if (!Number.isFinite(sink)) console.log('unexpected non-finite result')
