import Papa from 'papaparse'
import { worksheetListQuerySchema } from '../../../shared/schemas/worksheet'
import { WORKSHEET_STATE_LABELS } from '../../../shared/types/worksheet'
import { Accumulator, Aircraft, User, Worksheet } from '../../models'

/** The worksheets table, with the same filters, as CSV (up to 10 000 rows). */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(worksheetListQuerySchema))
  const rows = await Worksheet.findAll({
    where: worksheetFilter(query),
    include: [
      { model: User, as: 'performer', attributes: ['id', 'name'] },
      { model: Aircraft, as: 'aircraft', attributes: ['id', 'registration', 'fleetNumber'] },
      { model: Accumulator, as: 'accumulator', attributes: ['id', 'partNumber', 'serialNumber', 'position'] },
    ],
    order: [[query.sort, query.direction.toUpperCase()], ['id', query.direction.toUpperCase()]],
    limit: 10_000,
  })
  const csv = Papa.unparse(rows.map(worksheetListItem).map(item => ({
    'Worksheet': item.id,
    'State': WORKSHEET_STATE_LABELS[item.state],
    'Work order': item.workOrder,
    'Registration': item.registration,
    'Fleet number': item.fleetNumber,
    'Position': item.position,
    'Part number': item.partNumber,
    'Serial number': item.serialNumber,
    'Performer': item.performer,
    'As-found verdict': item.asFoundVerdict ?? '',
    'As-left verdict': item.asLeftVerdict ?? '',
    'Corrects worksheet': item.correctsId ?? '',
    'Performed at': item.performedAt ?? '',
    'Released at': item.releasedAt ?? '',
  })))
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-worksheets-${new Date().toISOString().slice(0, 10)}.csv"`)
  return csv
})
