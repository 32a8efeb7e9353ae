import { worksheetCreateSchema } from '../../../shared/schemas/worksheet'
import { canCorrect } from '../../../shared/utils/worksheet-rules'
import type { WorksheetContent } from '../../../shared/types/worksheet'
import { appendAudit } from '../../database/audit-chain'
import { Accumulator, Aircraft, Specification, SpecificationTablePoint, Worksheet } from '../../models'

/**
 * Starts a worksheet for an installed accumulator, freezing the current specification into it.
 * With `correctsId`, the new worksheet is a correction of a released one and points at it.
 */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician')
  const body = await readValidatedBody(event, validateWith(worksheetCreateSchema))
  const accumulator = await Accumulator.findByPk(body.accumulatorId, { include: [{ model: Aircraft, as: 'aircraft' }] })
  if (!accumulator?.aircraft) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'That accumulator is not installed on an aircraft.', data: { field: 'accumulatorId' } })
  const specification = await Specification.findOne({ where: { partNumber: accumulator.partNumber, status: 'current' }, include: [{ model: SpecificationTablePoint, as: 'tablePoints' }] })
  if (!specification) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: `There is no current specification for P/N ${accumulator.partNumber}. Ask engineering; do not service from memory.`, data: { field: 'accumulatorId' } })
  if (body.correctsId) {
    const corrected = await Worksheet.findByPk(body.correctsId)
    if (!corrected) throw createError({ status: 404, statusMessage: 'Not Found', message: 'The worksheet to correct was not found.' })
    enforce(canCorrect(user, corrected))
    if (corrected.accumulatorId !== accumulator.id) throw createError({ status: 422, statusMessage: 'Unprocessable Entity', message: 'A correction must be for the same accumulator as the worksheet it corrects.', data: { field: 'accumulatorId' } })
  }
  const { status: _status, ...frozen } = toSpecificationDto(specification)
  const content: WorksheetContent = {
    specification: frozen,
    aircraft: { id: accumulator.aircraft.id, registration: accumulator.aircraft.registration, fleetNumber: accumulator.aircraft.fleetNumber, type: accumulator.aircraft.type },
    accumulator: { id: accumulator.id, partNumber: accumulator.partNumber, serialNumber: accumulator.serialNumber, position: accumulator.position ?? '' },
  }
  const sequelize = await useDB()
  const worksheet = await sequelize.transaction(async (transaction) => {
    const created = await Worksheet.create({
      state: 'draft', accumulatorId: accumulator.id, aircraftId: accumulator.aircraft!.id, specificationId: specification.id, performerId: user.id,
      correctsId: body.correctsId ?? null, workOrder: body.workOrder, reason: body.reason, content: content as unknown as Record<string, unknown>, results: {},
      engineVersion: ENGINE_VERSION, serviceable: null, returnReason: null, voidReason: null, voidedById: null, performedAt: new Date(), submittedAt: null, releasedAt: null,
    }, { transaction })
    await appendAudit({ actorId: user.id, entity: 'worksheet', entityId: String(created.id), action: body.correctsId ? 'correction-started' : 'started', detail: { correctsId: body.correctsId ?? null, specification: `${specification.partNumber} rev ${specification.revision}` } }, transaction)
    return created
  })
  setResponseStatus(event, 201)
  return toWorksheetDto(await findWorksheet(worksheet.id))
})
