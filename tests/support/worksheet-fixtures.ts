import type { WorksheetStepBody } from '../../shared/schemas/worksheet'
import type { SpecificationDto } from '../../shared/types/registers'
import type { StepTool } from '../../shared/utils/worksheet-steps'

/**
 * A worksheet's inputs for tests that run the shared step rules without a server (invented demo data,
 * the same as the demo's main hydraulic accumulator: 1500 ± 50 psig at 21 °C, real gas, 15 min settle).
 */
export const SPECIFICATION: SpecificationDto = {
  id: 7,
  partNumber: 'FA-2210-03',
  revision: 'C',
  status: 'current',
  title: 'Main hydraulic accumulator, Tarnwing 46',
  accumulatorType: 'piston',
  gasVolume: 120,
  gasVolumeUnit: 'in3',
  pressureUnit: 'psi',
  pressureBasis: 'gauge',
  referencePressure: 1500,
  referenceTemperature: 21,
  referenceTemperatureUnit: 'C',
  toleranceMinus: 50,
  tolerancePlus: 50,
  toleranceUnit: 'psi',
  correctionMethod: 'gas-law',
  gasModel: 'real',
  maxPressure: 3000,
  minPressure: 1800,
  settleMinutes: 15,
  checkIntervalDays: 90,
  lossThresholdPerDay: 0.8,
  dataReference: 'TW46 SMM 29-11-10',
  dataRevision: 'Rev 14',
  tablePoints: [],
}

export const UNIT = { id: 31, partNumber: 'FA-2210-03', serialNumber: 'SN-4471', position: 'Main hydraulic, left wheel well' }
export const AIRCRAFT = { id: 3, registration: 'QX-FMA', fleetNumber: '401', type: 'Tarnwing 46' }

/** 0–4000 psi, 0.25 % of full scale: ±10 psi. */
export const GAUGE: StepTool = {
  id: 11,
  kind: 'gauge',
  active: true,
  assetNumber: 'GA-0141',
  description: 'Nitrogen charging gauge 0–4000 psi',
  calibrationDue: '2026-12-31',
  rangeMax: 4000,
  rangeUnit: 'psi',
  resolution: 20,
  accuracy: 0.25,
  accuracyUnit: '%FS',
}
export const CART: StepTool = {
  id: 12,
  kind: 'cart',
  active: true,
  assetNumber: 'NC-07',
  description: 'Nitrogen cart, two cylinders',
  calibrationDue: '2027-03-01',
  rangeMax: null,
  rangeUnit: null,
  resolution: null,
  accuracy: null,
  accuracyUnit: null,
}

export const psig = (value: number) => ({ value, unit: 'psi' as const, basis: 'gauge' as const })
export const celsius = (value: number) => ({ value, unit: 'C' as const })

/** The steps before the as-found, in order, at 15 °C and 420 ft. */
export const STEPS_TO_AS_FOUND: WorksheetStepBody[] = [
  { step: 'preparation', systemDepressurised: true, aircraftSafe: true, eyeProtection: true, nitrogenOnly: true },
  { step: 'tools', gaugeId: GAUGE.id, cartId: CART.id },
  {
    step: 'conditions',
    gasTemperature: celsius(15),
    temperatureMethod: 'ambient-shade',
    minutesSinceOperated: 240,
    ambient: { elevation: { value: 420, unit: 'ft' } },
  },
]
