import { idParamsSchema } from '../../../shared/schemas/auth'
import { worksheetStepSchema } from '../../../shared/schemas/worksheet'
import { canEdit } from '../../../shared/utils/worksheet-rules'

/** Saves one completed step. The server recomputes every figure; a signed worksheet answers 409. */
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'technician')
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const step = await readValidatedBody(event, validateWith(worksheetStepSchema))
  const sequelize = await useDB()
  await sequelize.transaction(async (transaction) => {
    const worksheet = await findWorksheet(id, transaction)
    enforce(canEdit(user, worksheet))
    const { content, results } = await applyStep(worksheet, step)
    await worksheet.update({ content: content as unknown as Record<string, unknown>, results: results as Record<string, unknown>, engineVersion: ENGINE_VERSION }, { transaction })
  })
  return toWorksheetDto(await findWorksheet(id))
})
