import { z } from 'zod'
import { booleanQuery, registerQuery, text } from './common'

/** The fleet register: aircraft. */
export const aircraftSchema = z
  .object({
    registration: text('registration', 20)
      .transform(value => value.toUpperCase())
      .refine(value => /^[A-Z0-9-]{2,20}$/.test(value), 'Letters, digits and hyphens only.'),
    fleetNumber: text('fleet number', 20),
    type: text('aircraft type', 60),
    base: text('base', 60),
    /** The operator's name or code; the organisation's own fleet when left out. */
    operator: z.string().trim().max(120).nullish().transform(value => value || undefined),
    active: z.boolean().default(true),
  })
  .strict()
export type AircraftBody = z.infer<typeof aircraftSchema>

export const aircraftUpdateSchema = aircraftSchema
  .partial()
  .strict()
  .refine(body => Object.keys(body).length > 0, 'Nothing to change.')
export const aircraftQuerySchema = z.object({
  ...registerQuery,
  type: z.string().max(60).optional(),
  base: z.string().max(60).optional(),
  active: booleanQuery,
  sort: z.enum(['registration', 'fleetNumber', 'type', 'base']).default('registration'),
})
