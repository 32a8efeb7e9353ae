import { worksheetListQuerySchema } from '../../../shared/schemas/worksheet'
import { WORKSHEET_STATE_LABELS } from '../../../shared/types/worksheet'
import { Accumulator, Aircraft, User, Worksheet } from '../../models'

const WORKSHEET_EXPORT_COLUMNS = [
  'Worksheet', 'State', 'Work order', 'Registration', 'Fleet number', 'Position', 'Part number', 'Serial number', 'Performer',
  'As-found verdict', 'As-left verdict', 'Corrects worksheet', 'Performed at', 'Released at',
]

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
  return sendCsv(event, 'worksheets', rows.map(worksheetListItem).map(item => ({
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
  })), WORKSHEET_EXPORT_COLUMNS)
})
