import { idParamsSchema } from '../../../../shared/schemas/auth'

/** The study as a PDF report: inputs, results per temperature, warnings, method and engine version. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const study = await findStudy(id)
  setResponseHeader(event, 'content-type', 'application/pdf')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-study-${study.id}.pdf"`)
  return Buffer.from(await studyPdf(toStudyDto(study)))
})
