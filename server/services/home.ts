import { Op, type WhereOptions } from 'sequelize'
import { can } from '#shared/abilities'
import type { WaitingWork, WorksheetQueue } from '#shared/types/work'
import { Tool, TrendAlert, Worksheet, type User } from '../models'
import { dueList } from './due'
import { alertsWithinScope, scopeOf, withinScope } from './scope'

/**
 * What waits for a user, by what their roles do. A few small indexed reads (state and
 * performer, created date), so Home stays instant at any size.
 */
const SHOWN = 5

async function worksheetQueue(where: WhereOptions, oldestFirst = false): Promise<WorksheetQueue> {
  const [count, rows] = await Promise.all([
    Worksheet.count({ where }),
    Worksheet.findAll({
      where,
      attributes: ['id', 'workOrder', 'registration', 'position', 'state', 'updatedAt'],
      order: [['createdAt', oldestFirst ? 'ASC' : 'DESC']],
      limit: SHOWN,
    }),
  ])
  return {
    count,
    items: rows.map(row => ({
      id: row.id,
      workOrder: row.workOrder,
      registration: row.registration,
      position: row.position,
      state: row.state,
      at: row.updatedAt.toISOString(),
    })),
  }
}

function alertLink(subject: string): string {
  const [kind, id] = subject.split(':')
  return kind === 'precharge' ? `/trends/units/${id}` : '/trends'
}

export async function waitingWorkFor(user: User): Promise<WaitingWork> {
  const work: WaitingWork = {}
  const scope = await scopeOf(user)
  if (can(user.roles, 'worksheet.perform')) {
    const mine = { performerId: user.id }
    const [drafts, returned, submitted] = await Promise.all([
      worksheetQueue(withinScope(scope, { ...mine, state: 'draft' })),
      worksheetQueue(withinScope(scope, { ...mine, state: 'returned' })),
      worksheetQueue(withinScope(scope, { ...mine, state: 'awaiting-countersign' })),
    ])
    Object.assign(work, { drafts, returned, submitted })
    // What to service today: the home station's units overdue or due within the week.
    const station = user.preferences?.stationName
    if (station) {
      const soon = (await dueList({ station }, scope)).items.filter(item => item.bucket === 'overdue' || item.bucket === 'this-week')
      work.due = { station, count: soon.length, items: soon.slice(0, SHOWN) }
    }
  }
  if (can(user.roles, 'worksheet.inspect')) {
    // Independent inspection: never one's own work.
    work.toCountersign = await worksheetQueue(withinScope(scope, { state: 'awaiting-countersign', performerId: { [Op.ne]: user.id } }), true)
  }
  if (can(user.roles, 'specification.manage') || can(user.roles, 'study.edit')) {
    const open = await alertsWithinScope(scope, await TrendAlert.findAll({ where: { clearedAt: null }, order: [['raisedAt', 'DESC']] }))
    work.alerts = {
      count: open.length,
      items: open
        .slice(0, SHOWN)
        .map(alert => ({
          subject: alert.subject,
          message: alert.message,
          raisedAt: alert.raisedAt.toISOString(),
          to: alertLink(alert.subject),
        })),
    }
  }
  if (can(user.roles, 'tool.manage')) {
    const today = stationToday()
    const soon = new Date(Date.parse(`${today}T12:00:00Z`) + 30 * 86_400_000).toISOString().slice(0, 10)
    const [expired, dueSoon] = await Promise.all([
      Tool.count({ where: { active: true, calibrationDue: { [Op.lt]: today } } }),
      Tool.count({ where: { active: true, calibrationDue: { [Op.gte]: today, [Op.lte]: soon } } }),
    ])
    work.tools = { expired, dueSoon }
  }
  return work
}
