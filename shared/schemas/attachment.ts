import { z } from 'zod'
import './plain-words'

/** The fields of an attachment upload (multipart/form-data, beside the `file` part), validated like any body. */
export const attachmentFieldsSchema = z.object({
  worksheetId: z.coerce.number({ invalid_type_error: 'Say which worksheet the file belongs to.' }).int().positive().max(2_147_483_647, 'Not a known id.'),
  kind: z.enum(['gauge-photo', 'certificate', 'other'], { errorMap: () => ({ message: 'The kind is gauge-photo, certificate or other.' }) }),
  /** The attachment this file replaces (a retaken photo). */
  replacesId: z.coerce.number({ invalid_type_error: 'Not a known attachment.' }).int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  /** The file's name, as a field: the multipart header's filename is cut at ";" and lost at "=". */
  fileName: z.string().trim().min(1, 'The file name is empty.').max(200, 'At most 200 characters.').optional(),
})
