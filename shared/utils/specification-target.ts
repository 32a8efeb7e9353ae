import {
  chargeTarget,
  chargeTargetFromTable,
  type ChargeTargetInput,
  type TableTargetInput,
} from '../gas/charge-target'
import type { Ambient, Pressure, PressureUnit, Temperature, Tolerance } from '../gas/types'
import { convertPressure, convertPressureDifference } from '../gas/units'
import type { SpecificationDto } from '../types/registers'

type SpecificationForTarget = Omit<SpecificationDto, 'id' | 'status' | 'title'>

export type SpecificationTargetRequest
  = { route: 'charge-target', body: ChargeTargetInput } | { route: 'table-target', body: TableTargetInput }

export function specificationPressure(
  specification: Pick<SpecificationDto, 'pressureUnit' | 'pressureBasis'>,
  value: number,
): Pressure {
  return { value, unit: specification.pressureUnit, basis: specification.pressureBasis }
}

/**
 * The engine input for a specification's charge target at a gas temperature: the gas-law
 * correction of its reference pre-charge, or interpolation in its approved-data table, as
 * the specification says. With `unit`, pressures and tolerance are stated in that unit, so
 * every answer comes back in it.
 */
export function specificationTargetRequest(
  specification: SpecificationForTarget,
  gasTemperature: Temperature,
  ambient?: Ambient,
  unit: PressureUnit = specification.pressureUnit,
): SpecificationTargetRequest {
  const pressure = (value: number) => convertPressure(specificationPressure(specification, value), unit)
  const tolerance: Tolerance
    = specification.toleranceUnit === '%'
      ? { minus: specification.toleranceMinus, plus: specification.tolerancePlus, unit: '%' }
      : {
          minus: convertPressureDifference(specification.toleranceMinus, specification.toleranceUnit, unit),
          plus: convertPressureDifference(specification.tolerancePlus, specification.toleranceUnit, unit),
          unit,
        }
  if (specification.correctionMethod === 'table') {
    return {
      route: 'table-target',
      body: {
        points: specification.tablePoints.map(point => ({
          temperature: { value: point.temperature, unit: point.temperatureUnit },
          pressure: pressure(point.pressure),
        })),
        gasTemperature,
        ambient,
        tolerance,
      },
    }
  }
  return {
    route: 'charge-target',
    body: {
      reference: {
        pressure: pressure(specification.referencePressure),
        temperature: { value: specification.referenceTemperature, unit: specification.referenceTemperatureUnit },
      },
      gasTemperature,
      ambient,
      model: specification.gasModel,
      tolerance,
    },
  }
}

/** The charge target for a specification, computed here (server side: worksheets, seed). */
export function specificationChargeTarget(
  specification: SpecificationForTarget,
  gasTemperature: Temperature,
  ambient?: Ambient,
) {
  const request = specificationTargetRequest(specification, gasTemperature, ambient)
  return request.route === 'table-target' ? chargeTargetFromTable(request.body) : chargeTarget(request.body)
}
