import { z } from 'zod'
import { booleanQuery, isoDate, registerQuery, text } from './common'

/** Installed accumulators: registration, corrections, moves between aircraft. */
export const accumulatorSchema = z
  .object({
    partNumber: text('part number', 60),
    serialNumber: text('serial number', 60),
    system: z.string().trim().max(80).nullable().default(null),
    aircraftId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').nullable().default(null),
    position: z.string().trim().max(80).nullable().default(null),
    installedAt: isoDate.nullable().default(null),
  })
  .strict()
  .superRefine((body, context) => {
    if (body.aircraftId && !body.position)
      context.addIssue({ code: 'custom', path: ['position'], message: 'Give the position on the aircraft.' })
    if (body.aircraftId && !body.installedAt)
      context.addIssue({ code: 'custom', path: ['installedAt'], message: 'Give the date it was installed.' })
  })

/** Moving a unit: off its aircraft (aircraftId null) or onto another; its history is kept. */
export const accumulatorMoveSchema = z
  .object({
    aircraftId: z.number().int().positive().max(2_147_483_647, 'Not a known id.').nullable(),
    position: z.string().trim().max(80).optional(),
    date: isoDate,
    reason: z.string().trim().max(200).optional(),
  })
  .strict()
  .superRefine((move, context) => {
    if (move.aircraftId && !move.position)
      context.addIssue({ code: 'custom', path: ['position'], message: 'Give the new position.' })
  })

export type AccumulatorMoveBody = z.infer<typeof accumulatorMoveSchema>

export const accumulatorUpdateSchema = z
  .object({
    partNumber: text('part number', 60).optional(),
    serialNumber: text('serial number', 60).optional(),
    system: z.string().trim().max(80).nullable().optional(),
    move: accumulatorMoveSchema.optional(),
  })
  .strict()
  .refine(body => Object.keys(body).length > 0, 'Nothing to change.')

export const accumulatorQuerySchema = z.object({
  ...registerQuery,
  installed: booleanQuery,
  aircraftId: z.coerce.number().int().positive().max(2_147_483_647, 'Not a known id.').optional(),
  partNumber: z.string().max(60).optional(),
  type: z.string().max(60).optional(),
  base: z.string().max(60).optional(),
  sort: z.enum(['partNumber', 'serialNumber', 'position', 'installedAt']).default('partNumber'),
})
