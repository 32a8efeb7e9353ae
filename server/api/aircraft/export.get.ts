import { Aircraft } from '../../models'

const AIRCRAFT_COLUMNS = ['registration', 'fleetNumber', 'type', 'base', 'active']

/** The fleet as CSV, in the import format. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const rows = await Aircraft.findAll({ order: [['registration', 'ASC']] })
  return sendCsv(event, 'aircraft', rows.map(row => row.get({ plain: true })), AIRCRAFT_COLUMNS)
})
