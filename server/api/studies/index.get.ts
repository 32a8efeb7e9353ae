import { Op } from 'sequelize'
import { studyListQuerySchema } from '../../../shared/schemas/study'
import { SizingStudy, Specification, User } from '../../models'

/** Saved sizing studies, newest first, with search; every signed-in role may read them. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const query = await getValidatedQuery(event, validateWith(studyListQuerySchema))
  const where = {
    ...(query.q ? { name: { [Op.like]: `%${query.q}%` } } : {}),
    ...(query.specificationId ? { specificationId: query.specificationId } : {}),
  }
  const { rows, count } = await SizingStudy.findAndCountAll({
    where,
    attributes: ['id', 'name', 'specificationId', 'engineVersion', 'updatedAt', 'createdById'],
    include: [{ model: Specification, as: 'specification', attributes: ['partNumber', 'revision'] }],
    order: [['updatedAt', 'DESC'], ['id', 'DESC']],
    limit: query.pageSize,
    offset: (query.page - 1) * query.pageSize,
  })
  const authors = new Map((await User.findAll({ attributes: ['id', 'name'] })).map(user => [user.id, user.name]))
  return {
    total: count,
    items: rows.map(study => ({
      id: study.id,
      name: study.name,
      specification: study.specification ? `${study.specification.partNumber} rev ${study.specification.revision}` : null,
      engineVersion: study.engineVersion,
      updatedAt: study.updatedAt.toISOString(),
      author: authors.get(study.createdById) ?? '',
    })),
  }
})
