import { idParamsSchema } from '../../../../shared/schemas/auth'

/** A released (or voided) record as a PDF. */
export default defineEventHandler(async (event) => {
  await requireRole(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const worksheet = await toWorksheetDto(await findWorksheet(id))
  if (worksheet.state !== 'released' && worksheet.state !== 'voided') {
    throw createError({ status: 409, statusMessage: 'Conflict', message: 'Only a released (or voided) worksheet is issued as a PDF record; use the print page to review a draft.' })
  }
  const pdf = await worksheetPdf(worksheet)
  setResponseHeader(event, 'content-type', 'application/pdf')
  setResponseHeader(event, 'content-disposition', `attachment; filename="chargewell-worksheet-${worksheet.id}.pdf"`)
  return Buffer.from(pdf)
})
