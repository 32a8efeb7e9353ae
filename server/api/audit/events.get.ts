import { Op } from 'sequelize'
import { auditEventQuerySchema } from '../../../shared/schemas/audit'
import { describeAuditEvent, type AuditEventDto } from '../../../shared/utils/audit-words'
import { AuditEvent, User } from '../../models'

/** The audit trail in words, newest first: who changed what (role changes, voids, corrections …). */
export default defineEventHandler(async (event) => {
  await requireAbility(event, 'audit.verify')
  const query = await getValidatedQuery(event, validateWith(auditEventQuerySchema))
  const { total, rows } = await pageOf(AuditEvent, {
    where: query.entity ? { entity: query.entity } : {},
    order: [['id', 'DESC']],
    page: query.page,
    pageSize: query.pageSize,
  })
  const people = await User.findAll({
    where: { id: { [Op.in]: [...new Set(rows.flatMap(row => [row.actorId, row.entity === 'user' ? Number(row.entityId) : null]).filter((id): id is number => Number.isInteger(id)))] } },
    attributes: ['id', 'name'],
  })
  const nameOf = new Map(people.map(person => [person.id, person.name]))
  const items: AuditEventDto[] = rows.map(row => ({
    id: row.id, at: row.at.toISOString(), actor: row.actorId ? nameOf.get(row.actorId) ?? `user ${row.actorId}` : null,
    entity: row.entity, entityId: row.entityId, action: row.action,
    text: describeAuditEvent(row, row.entity === 'user' ? nameOf.get(Number(row.entityId)) : null),
  }))
  return { total, items }
})
