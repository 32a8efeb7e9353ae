import { worksheetExportQuerySchema } from '../../../shared/schemas/worksheet'
import { WORKSHEET_STATE_LABELS } from '../../../shared/types/worksheet'
import { allWorksheets } from '../../services/worksheet-list'

const COLUMNS = [
  'Worksheet', 'State', 'Work order', 'Registration', 'Fleet number', 'Position', 'Part number', 'Serial number', 'Performer',
  'As-found verdict', 'As-left verdict', 'Corrects worksheet', 'Performed at', 'Released at',
]

/** Every worksheet the filters match, as CSV, streamed a thousand rows at a time: any size, constant memory. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(worksheetExportQuerySchema))
  return streamCsv(event, 'worksheets', COLUMNS, (async function* () {
    for await (const batch of allWorksheets(query)) {
      yield batch.map(item => [
        item.id, WORKSHEET_STATE_LABELS[item.state], item.workOrder, item.registration, item.fleetNumber, item.position, item.partNumber, item.serialNumber,
        item.performer, item.asFoundVerdict ?? '', item.asLeftVerdict ?? '', item.correctsId ?? '', item.performedAt ?? '', item.releasedAt ?? '',
      ])
    }
  })())
})
