/**
 * `npm run bench`: median cost of the engine's hot paths in Node, printed, not asserted.
 * Goals: ≤ 5 µs per real-gas charge target, ≤ 2 ms per 250-point correction curve, and each
 * route's computation at most ¼ of the time CoolProp's low-level interface (AbstractState,
 * HEOS nitrogen = Span et al. 2000) takes for the same computation, measured in the same run
 * by `tests/bench/coolprop-reference.py` when Python can import CoolProp
 * (`CHARGEWELL_COOLPROP_PYTHON` names the interpreter; default `python3`).
 */
import { spawnSync } from 'node:child_process'
import { fileURLToPath } from 'node:url'
import { chargeTarget, correctionCurve } from '../../shared/gas/charge-target'
import { leakRate } from '../../shared/gas/leakage'
import { requiredVolume, usableVolume } from '../../shared/gas/usable-volume'

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

// The same conditions as coolprop-reference.py, case for case.
const psig = (value: number) => ({ value, unit: 'psi' as const, basis: 'gauge' as const })
const celsius = (value: number) => ({ value, unit: 'C' as const })
const in3 = (value: number) => ({ value, unit: 'in3' as const })
const reference = { pressure: psig(1500), temperature: celsius(21) }
const tolerance = { minus: 50, plus: 50, unit: 'psi' as const }
const sizing = (index: number) => ({
  precharge: psig(1500), prechargeTemperature: celsius(21), operatingTemperature: celsius(-40 + (index % 90)),
  maxPressure: psig(3000), minPressure: psig(1800),
})
const cycle = (index: number) => ({
  gasVolume: in3(120), precharge: psig(1500), prechargeTemperature: celsius(21),
  temperature: celsius(-20 + (index % 60)), cutOut: psig(3000), cutIn: psig(2700),
  interval: { value: 10, unit: 'min' as const },
})
let sink = 0

const ours = {
  chargeTarget: measure(index => sink += chargeTarget({ reference, gasTemperature: celsius(-40 + (index % 100)) })
    .target.value, 2000),
  usableVolume: measure(index => sink += usableVolume({ ...sizing(index), gasVolume: in3(120), perApplication: in3(3) })
    .usableVolume.value, 200),
  requiredVolume: measure(index => sink += requiredVolume({ ...sizing(index), usable: in3(40) }).gasVolume.value, 200),
  leakRate: measure(index => sink += leakRate(cycle(index)).leakRate.value, 500),
}
const targetBand = measure(index => sink += chargeTarget({
  reference, tolerance, gasTemperature: celsius(-40 + (index % 100)),
})
  .target.value, 2000)
const curve = measure(index => sink += correctionCurve({
  reference, tolerance, from: celsius(-55 + (index % 3)), to: celsius(70), points: 250,
}).target[0]!, 20)

const row = (label: string, microseconds: number, goal?: string) =>
  console.log(`${label.padEnd(52)} ${microseconds.toFixed(2).padStart(10)} µs${goal ? `   (goal ${goal})` : ''}`)
console.log(`Chargewell engine benchmark — Node ${process.version}, median of 41 batches\n`)
row('real-gas charge target', ours.chargeTarget, '≤ 5 µs')
row('real-gas charge target with tolerance band', targetBand)
row('real-gas usable volume (isentropic discharge, N apps)', ours.usableVolume)
row('real-gas required volume (with its check)', ours.requiredVolume)
row('real-gas leak rate (cut-out to cut-in)', ours.leakRate)
row('250-point correction curve with band (real gas)', curve, '≤ 2000 µs')

interface Reference {
  library: string
  microseconds: Record<keyof typeof ours, number>
  figures: Record<string, number>
}
function coolProp(): Reference | string {
  const python = process.env.CHARGEWELL_COOLPROP_PYTHON || 'python3'
  const script = fileURLToPath(new URL('./coolprop-reference.py', import.meta.url))
  const run = spawnSync(python, [script], { encoding: 'utf8' })
  if (run.error || run.status !== 0) {
    const why = run.error?.message ?? run.stderr.trim().split('\n').at(-1) ?? `exit ${run.status}`
    return `${python}: ${why}. Install CoolProp for Python (pip install coolprop) or name an interpreter that has it in CHARGEWELL_COOLPROP_PYTHON.`
  }
  return JSON.parse(run.stdout) as Reference
}

const library = coolProp()
console.log('\nAgainst CoolProp\'s low-level interface (AbstractState, HEOS nitrogen), same computations, same run:')
if (typeof library === 'string') {
  console.log(`  not measured — ${library}`)
}
else {
  console.log(`  ${library.library}; goal: each at most 0.25× CoolProp's time\n`)
  for (const key of Object.keys(ours) as (keyof typeof ours)[]) {
    const ratio = ours[key] / library.microseconds[key]
    const theirs = library.microseconds[key]
    console.log(`  ${key.padEnd(16)} ours ${ours[key].toFixed(2).padStart(8)} µs   CoolProp ${theirs.toFixed(2).padStart(8)} µs`
      + `   ${ratio.toFixed(2)}×${ratio <= 0.25 ? '' : '   (above the goal)'}`)
  }
  // The figures agree too (they are the same equation of state): the cases coolprop-reference.py prints.
  const target = chargeTarget({ reference, gasTemperature: celsius(-40) }).target.value
  const usable = usableVolume({ ...sizing(40), gasVolume: in3(120), perApplication: in3(3) }).usableVolume.value
  const leak = leakRate(cycle(20)).leakRate.value
  const agree = (label: string, mine: number, theirs: number) => console.log(`  ${label.padEnd(34)} ours ${mine.toFixed(6)}`
    + `   CoolProp ${theirs.toFixed(6)}   relative ${(mine / theirs - 1).toExponential(1)}`)
  console.log('')
  agree('charge target at −40 °C, psig', target, library.figures.chargeTargetAtMinus40Psig!)
  agree('usable volume at 0 °C, in³', usable, library.figures.usableVolumeAt0In3!)
  agree('leak rate at 0 °C, in³/min', leak, library.figures.leakRateAt0In3PerMin!)
}
if (!Number.isFinite(sink)) console.log('unexpected non-finite result')
