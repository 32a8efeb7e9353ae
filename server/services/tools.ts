import type { H3Event } from 'h3'
import { Op, type Model, type ModelStatic } from 'sequelize'
import type { z } from 'zod'
import type { toolQuerySchema, toolUpdateSchema } from '#shared/schemas/tools'
import { toolCsvRow } from '#shared/schemas/csv'
import { toolSchema } from '#shared/schemas/tools'
import type { ToolDto } from '#shared/types/registers'
import { Tool, type User } from '../models'
import { createAudited, findOr404, updateAudited } from './audited-writes'
import { announceCalibrationsDue } from './webhooks'

/** Gauges and nitrogen carts, with their calibration state at the station today. */

export function toToolDto(tool: Tool): ToolDto {
  const today = stationToday()
  const { createdAt: _created, updatedAt: _updated, ...fields } = tool.get({ plain: true })
  return {
    ...fields,
    calibrationExpired: tool.calibrationDue !== null && tool.calibrationDue < today,
    calibrationMissing: tool.kind === 'gauge' && tool.calibrationDue === null,
  }
}

export async function listTools(query: z.infer<typeof toolQuerySchema>) {
  const today = stationToday()
  const calibration = query.calibration === 'expired'
    ? { calibrationDue: { [Op.lt]: today } }
    : query.calibration === 'valid' ? { calibrationDue: { [Op.gte]: today } } : {}
  const { total, totalCapped, rows } = await pageOf(Tool, {
    where: {
      ...searchWhere(query.q, ['assetNumber', 'description']),
      ...(query.kind ? { kind: query.kind } : {}),
      ...(query.active !== undefined ? { active: query.active } : {}),
      ...calibration,
    },
    order: [[query.sort, query.direction.toUpperCase()]],
    page: query.page,
    pageSize: query.pageSize,
  })
  return { total, totalCapped, items: rows.map(toToolDto) }
}

export async function toolById(id: number): Promise<ToolDto> {
  return toToolDto(await findOr404(Tool, id, 'Tool'))
}

export async function createTool(actor: User, body: z.infer<typeof toolSchema>): Promise<ToolDto> {
  const conflict = 'A tool with that asset number is already registered.'
  const created = await createAudited(Tool, body, { actor, entity: 'tool', action: 'created', detail: body, conflict })
  if (body.calibrationDue) await announceCalibrationsDue()
  return toToolDto(created)
}

/** A new calibration, corrected figures, or the tool withdrawn (active: false). */
export async function updateTool(actor: User, id: number, body: z.infer<typeof toolUpdateSchema>): Promise<ToolDto> {
  const tool = await findOr404(Tool, id, 'Tool')
  // The tool as it would be must still be a whole tool: a gauge keeps a range and an accuracy.
  const { id: _id, createdAt: _created, updatedAt: _updated, ...current } = tool.get({ plain: true })
  parseInput(toolSchema, { ...current, ...body })
  await updateAudited(tool, body, { actor, entity: 'tool', action: 'updated', detail: body, conflict: 'That asset number is taken.' })
  // A new calibration date that falls within 30 days is announced now, not at the next hourly check.
  if (body.calibrationDue !== undefined) await announceCalibrationsDue()
  return toToolDto(tool)
}

/** Gauges and carts from CSV: every row valid, or nothing imported. */
export function importTools(event: H3Event, actor: User) {
  // By asset number: a new tool is added, a known one takes the edited cells (a new calibration date).
  return importCsv(event, toolCsvRow, (row, transaction) => upsertRow({
    model: Tool as ModelStatic<Model>,
    where: { assetNumber: row.assetNumber },
    fields: row,
    key: row.assetNumber,
    entity: 'tool',
    actor,
    transaction,
  }))
}
