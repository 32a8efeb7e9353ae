import { Tool } from '../../models'

/** Gauges and nitrogen carts, with their calibration state, for every signed-in role. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const today = new Date().toISOString().slice(0, 10)
  const tools = await Tool.findAll({ where: { active: true }, order: [['kind', 'DESC'], ['assetNumber', 'ASC']] })
  return tools.map(tool => ({
    ...tool.get({ plain: true }),
    calibrationExpired: tool.calibrationDue !== null && tool.calibrationDue < today,
    calibrationMissing: tool.kind === 'gauge' && tool.calibrationDue === null,
  }))
})
