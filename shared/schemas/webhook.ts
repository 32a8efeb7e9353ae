import { z } from 'zod'
import { SUBSCRIBABLE_EVENTS } from '../types/webhook'

const events = z
  .array(z.enum(SUBSCRIBABLE_EVENTS, { errorMap: () => ({ message: `An event is one of ${SUBSCRIBABLE_EVENTS.join(', ')}.` }) }))
  .min(1, 'Choose at least one event.')
  .transform(chosen => [...new Set(chosen)])

const LOOPBACK = /^(localhost|127(?:\.\d{1,3}){3}|\[::1\])$/

/** An HTTPS address (plain HTTP only to this machine, for a receiver beside the server). */
const url = z
  .string({ required_error: 'Give the address that receives the events.' })
  .trim()
  .max(500, 'At most 500 characters.')
  .url('Give a full address, like https://mro.example/hooks/chargewell.')
  .refine((value) => {
    const address = new URL(value)
    return address.protocol === 'https:' || (address.protocol === 'http:' && LOOPBACK.test(address.hostname))
  }, 'Use an https:// address (plain http:// only to this machine).')

/** A new endpoint: where, what for, which events. The answer holds its signing secret once. */
export const webhookCreateSchema = z
  .object({
    url,
    description: z.string().trim().min(2, 'Say what receives the events (a system\'s name).').max(200),
    events,
  })
  .strict()
export type WebhookCreateBody = z.infer<typeof webhookCreateSchema>

/** Changes to an endpoint: its description, events, or whether it is sent to. */
export const webhookUpdateSchema = z
  .object({
    description: z.string().trim().min(2, 'Say what receives the events (a system\'s name).').max(200),
    events,
    active: z.boolean({ invalid_type_error: 'Say true or false.' }),
  })
  .partial()
  .strict()
  .refine(body => Object.keys(body).length > 0, 'Change at least one of description, events or active.')
export type WebhookUpdateBody = z.infer<typeof webhookUpdateSchema>

export const webhookDeliveryQuerySchema = z
  .object({
    status: z.enum(['queued', 'sending', 'delivered', 'failed']).optional(),
    limit: z.coerce.number().int().min(1).max(500).default(100),
  })
  .strict()
