import { z } from 'zod'
import { aircraftSchema } from './aircraft'
import { csvRow } from './plain-words'
import { specificationSchema } from './specifications'
import { toolSchema } from './tools'

/**
 * The registers' CSV rows: cells read from their text, then checked by each register's own schema.
 * CSV cells are text: empty means "not given", numbers and booleans are read from their text.
 */
const cell = {
  text: z.string().trim(),
  optionalText: z
    .string()
    .trim()
    .transform(value => value || null),
  number: z
    .string({ required_error: 'The column is missing or the cell is empty.' })
    .trim()
    .min(1, 'Give a number.')
    .transform(Number)
    .pipe(z.number({ invalid_type_error: 'Not a number.' }).finite('Not a number.')),
  optionalNumber: z
    .string()
    .trim()
    .transform(value => (value === '' ? null : Number(value)))
    .pipe(z.number({ invalid_type_error: 'Not a number.' }).finite('Not a number.').nullable()),
  boolean: z
    .string()
    .trim()
    .toLowerCase()
    .transform(value => value === '' || ['true', 'yes', '1'].includes(value)),
}

export const aircraftCsvRow = csvRow(
  {
    registration: cell.text,
    fleetNumber: cell.text,
    type: cell.text,
    base: cell.text,
    operator: cell.optionalText.default(''),
    active: cell.boolean.default('true'),
  },
  aircraftSchema,
)

export const accumulatorCsvRow = z.object({
  partNumber: cell.text,
  serialNumber: cell.text,
  system: cell.optionalText.default(''),
  registration: cell.optionalText.default(''),
  position: cell.optionalText.default(''),
  installedAt: cell.optionalText.default(''),
})

export const toolCsvRow = csvRow(
  {
    kind: cell.text,
    assetNumber: cell.text,
    description: cell.text,
    rangeMax: cell.optionalNumber.default(''),
    rangeUnit: cell.optionalText.default(''),
    resolution: cell.optionalNumber.default(''),
    accuracy: cell.optionalNumber.default(''),
    accuracyUnit: cell.optionalText.default(''),
    calibrationDue: cell.optionalText.default(''),
    active: cell.boolean.default('true'),
  },
  toolSchema,
)

/** Table points in one cell: "-40 C 1170; 0 C 1390; 20 C 1500". */
const tablePointsCell = z
  .string()
  .trim()
  .transform((value, context) => {
    if (!value) return []
    return value.split(';').map((entry) => {
      const match = entry.trim().match(/^(-?\d+(?:\.\d+)?)\s*([CFKR])\s+(\d+(?:\.\d+)?)$/)
      if (!match) {
        context.addIssue({
          code: 'custom',
          message: `"${entry.trim()}" is not "temperature unit pressure", e.g. "-40 C 1170".`,
        })
        return { temperature: 0, temperatureUnit: 'C' as const, pressure: 0 }
      }
      return { temperature: Number(match[1]), temperatureUnit: match[2] as 'C', pressure: Number(match[3]) }
    })
  })

export const specificationCsvRow = csvRow(
  {
    partNumber: cell.text,
    revision: cell.text,
    title: cell.text,
    accumulatorType: cell.text,
    gasVolume: cell.number,
    gasVolumeUnit: cell.text,
    pressureUnit: cell.text,
    pressureBasis: cell.text,
    referencePressure: cell.number,
    referenceTemperature: cell.number,
    referenceTemperatureUnit: cell.text,
    toleranceMinus: cell.number,
    tolerancePlus: cell.number,
    toleranceUnit: cell.text,
    correctionMethod: cell.text,
    gasModel: cell.text.default('real'),
    maxPressure: cell.number,
    minPressure: cell.number,
    settleMinutes: cell.number,
    checkIntervalDays: cell.optionalNumber.default(''),
    lossThresholdPerDay: cell.optionalNumber.default(''),
    dataReference: cell.text,
    dataRevision: cell.text,
    tablePoints: tablePointsCell.default(''),
  },
  specificationSchema,
)
