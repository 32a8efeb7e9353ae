import { Tool } from '../../models'

export default defineEventHandler(async (event) => {
  await requireRole(event)
  const rows = await Tool.findAll({ order: [['kind', 'DESC'], ['assetNumber', 'ASC']] })
  return sendCsv(event, 'tools', rows.map(row => row.get({ plain: true })), ['kind', 'assetNumber', 'description', 'rangeMax', 'rangeUnit', 'resolution', 'accuracy', 'accuracyUnit', 'calibrationDue', 'active'])
})
