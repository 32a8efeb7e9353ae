import type { SpecificationDto } from '../../shared/types/registers'
import type { Specification } from '../models'

export function toSpecificationDto(specification: Specification): SpecificationDto {
  const { createdAt: _created, updatedAt: _updated, supersedesId: _supersedes, tablePoints, ...fields } = specification.get({ plain: true }) as Specification
  return {
    ...fields,
    tablePoints: (tablePoints ?? [])
      .map(point => ({ temperature: point.temperature, temperatureUnit: point.temperatureUnit, pressure: point.pressure }))
      .sort((a, b) => a.temperature - b.temperature),
  }
}
