import { noQuerySchema } from '../../../shared/schemas/cycle-check'
import type { FleetOptions } from '../../../shared/types/fleet'
import { Aircraft } from '../../models'

/** The aircraft types and bases in the fleet register, for filters: options come from the data, never from the page. */
export default defineEventHandler(async (event): Promise<FleetOptions> => {
  await requireRole(event)
  await getValidatedQuery(event, validateWith(noQuerySchema))
  const distinct = async (column: 'type' | 'base') => (await Aircraft.findAll({ attributes: [column], group: [column], order: [[column, 'ASC']], raw: true })).map(row => row[column])
  return { types: await distinct('type'), bases: await distinct('base') }
})
