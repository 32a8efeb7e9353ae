import { z } from 'zod'

export const dueQuerySchema = z
  .object({
    station: z.string().trim().min(1, 'Name a station.').max(80, 'At most 80 characters.').optional(),
    bucket: z.enum(['overdue', 'this-week', 'this-month', 'later'], { errorMap: () => ({ message: 'Choose overdue, this-week, this-month or later.' }) }).optional(),
  })
  .strict()

export const dueCalendarQuerySchema = z
  .object({
    station: z.string({ required_error: 'Name the station.' }).trim().min(1, 'Name the station.').max(80, 'At most 80 characters.'),
    /** The user whose calendar address this is (with `key`). */
    user: z.coerce.number().int().positive().max(2_147_483_647).optional(),
    key: z.string().max(64).optional(),
  })
  .strict()
