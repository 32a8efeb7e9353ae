import { Specification, SpecificationTablePoint } from '../../models'

const COLUMNS = [
  'partNumber', 'revision', 'title', 'accumulatorType', 'gasVolume', 'gasVolumeUnit', 'pressureUnit', 'pressureBasis', 'referencePressure',
  'referenceTemperature', 'referenceTemperatureUnit', 'toleranceMinus', 'tolerancePlus', 'toleranceUnit', 'correctionMethod', 'gasModel',
  'maxPressure', 'minPressure', 'settleMinutes', 'checkIntervalDays', 'lossThresholdPerDay', 'dataReference', 'dataRevision', 'tablePoints', 'status',
]

/** Specifications as CSV in the import format; table points as "-40 C 1170; 0 C 1390". */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const rows = await Specification.findAll({ include: [{ model: SpecificationTablePoint, as: 'tablePoints' }], order: [['partNumber', 'ASC'], ['revision', 'ASC']] })
  return sendCsv(event, 'specifications', rows.map(toSpecificationDto).map(row => ({
    ...row, tablePoints: row.tablePoints.map(point => `${point.temperature} ${point.temperatureUnit} ${point.pressure}`).join('; '),
  })), COLUMNS)
})
