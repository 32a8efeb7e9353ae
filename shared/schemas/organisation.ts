import { z } from 'zod'
import { text } from './common'

/** Stations, operators, and what each user may see. */

const timeZoneSchema = z
  .string({ required_error: 'Enter the time zone.' })
  .trim()
  .min(1, 'Enter the time zone.')
  .max(60)
  .refine((zone) => {
    try {
      new Intl.DateTimeFormat('en-GB', { timeZone: zone })
      return true
    }
    catch {
      return false
    }
  }, 'Use a time zone name like Europe/London or UTC.')

const codeSchema = (what: string) =>
  text(what, 8)
    .transform(value => value.toUpperCase())
    .refine(value => /^[A-Z0-9-]{2,8}$/.test(value), 'Two to eight letters, digits or hyphens.')

const elevationSchema = z
  .object({
    value: z.number({ required_error: 'Enter the field elevation.', invalid_type_error: 'The elevation must be a number.' }).finite(),
    unit: z.enum(['ft', 'm'], { errorMap: () => ({ message: 'Elevation unit must be ft or m.' }) }),
  })
  .strict()
  .refine(({ value, unit }) => {
    const metres = unit === 'ft' ? value * 0.3048 : value
    return metres >= -610 && metres <= 5000
  }, { message: 'A field elevation lies between −610 m and 5 000 m (−2 000 ft and 16 400 ft).', path: ['value'] })

export const stationSchema = z
  .object({
    name: text('station name', 60),
    code: codeSchema('station code'),
    timeZone: timeZoneSchema,
    elevation: elevationSchema,
  })
  .strict()
export type StationBody = z.infer<typeof stationSchema>

/** A station's name is what its aircraft name as their base: it is not changed (add a new station instead). */
export const stationUpdateSchema = stationSchema
  .omit({ name: true })
  .partial()
  .strict()
  .refine(body => Object.keys(body).length > 0, 'Nothing to change.')

export const operatorSchema = z
  .object({
    name: text('operator name', 120),
    code: codeSchema('operator code'),
  })
  .strict()
export type OperatorBody = z.infer<typeof operatorSchema>

export const operatorUpdateSchema = operatorSchema
  .partial()
  .strict()
  .refine(body => Object.keys(body).length > 0, 'Nothing to change.')

const idList = (what: string) =>
  z
    .array(z.number({ invalid_type_error: `Each ${what} is an id.` }).int().positive(), { invalid_type_error: `Give the ${what}s as a list, or null for all.` })
    .max(500)
    .transform(ids => [...new Set(ids)].sort((a, b) => a - b))
    .nullable()

/** What a user may see: station and operator ids; null grants every one. */
export const userScopeSchema = z
  .object({
    stationIds: idList('station').refine(ids => ids === null || ids.length > 0, 'Grant at least one station, or every station.'),
    operatorIds: idList('operator').refine(ids => ids === null || ids.length > 0, 'Grant at least one operator, or every operator.'),
  })
  .strict()
export type UserScopeBody = z.infer<typeof userScopeSchema>
