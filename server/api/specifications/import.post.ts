import { specificationCsvRow } from '../../../shared/schemas/registers'
import { Specification } from '../../models'
import { trendAfterSpecificationChange } from '../../services/trends'

/**
 * Imports specifications from CSV: a new part number is added; a new revision of a part number
 * supersedes its current one. Every row valid, or nothing imported.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'engineer')
  const partNumbers = new Set<string>()
  const report = await importCsv(event, specificationCsvRow, async (row, transaction) => {
    partNumbers.add(row.partNumber)
    const current = await Specification.findOne({ where: { partNumber: row.partNumber, status: 'current' }, transaction })
    await createRevision(row, current?.id ?? null, user.id, transaction)
  }, async (row, line) => {
    const same = await Specification.findOne({ where: { partNumber: row.partNumber, revision: row.revision } })
    return same ? [{ line, field: 'revision', message: `P/N ${row.partNumber} rev ${row.revision} is already in the register.` }] : []
  })
  for (const partNumber of partNumbers) await trendAfterSpecificationChange(partNumber)
  return report
})
