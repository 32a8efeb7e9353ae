import { idParamsSchema } from '../../../shared/schemas/auth'
import { Accumulator, AccumulatorInstallation, Aircraft, Worksheet } from '../../models'

/** One accumulator with where it has been (installations) and its worksheets. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const accumulator = await Accumulator.findByPk(id, { include: [{ model: Aircraft, as: 'aircraft' }] })
  if (!accumulator) throw createError({ status: 404, statusMessage: 'Not Found', message: 'Accumulator not found.' })
  const installations = await AccumulatorInstallation.findAll({ where: { accumulatorId: id }, include: [{ model: Aircraft, as: 'aircraft', attributes: ['registration', 'fleetNumber'] }], order: [['installedAt', 'DESC'], ['id', 'DESC']] })
  const worksheets = await Worksheet.findAll({ where: { accumulatorId: id }, attributes: ['id', 'state', 'workOrder', 'performedAt', 'results'], order: [['performedAt', 'DESC']], limit: 50 })
  return {
    ...(await toInstalledUnits([accumulator]))[0],
    installations: installations.map(installation => ({
      aircraft: (installation as AccumulatorInstallation & { aircraft?: Aircraft }).aircraft?.registration ?? '',
      position: installation.position, installedAt: installation.installedAt, removedAt: installation.removedAt, removalReason: installation.removalReason,
    })),
    worksheets: worksheets.map(worksheet => ({
      id: worksheet.id, state: worksheet.state, workOrder: worksheet.workOrder, performedAt: worksheet.performedAt?.toISOString() ?? null,
      asFoundVerdict: (worksheet.results as { asFound?: { assessment: { verdict: string } } }).asFound?.assessment.verdict ?? null,
    })),
  }
})
