import { z } from 'zod'
import { ACCUMULATOR_TYPES } from '../types/registers'
import {
  ambientSchema, gasModelSchema, pressureSchema, processSchema, temperatureSchema, volumeSchema,
} from './quantities'

export const studyInputSchema = z.object({
  name: z.string({ required_error: 'Name the study.' }).trim().min(3, 'Name the study in a few words.').max(160),
  specificationId: z.number().int().positive().nullable().default(null),
  accumulatorType: z.enum(ACCUMULATOR_TYPES, { errorMap: () => ({ message: 'The type is piston, bladder or diaphragm.' }) }),
  gasVolume: volumeSchema,
  precharge: pressureSchema,
  prechargeTemperature: temperatureSchema,
  maxPressure: pressureSchema,
  minPressure: pressureSchema,
  perApplication: volumeSchema.optional(),
  charge: processSchema.default('isothermal'),
  discharge: processSchema.default('adiabatic'),
  model: gasModelSchema.default('real'),
  ambient: ambientSchema.optional(),
  envelope: z.array(z.object({ label: z.string().trim().min(1, 'Label each temperature.').max(40), temperature: temperatureSchema }))
    .min(1, 'Give at least one temperature.').max(6, 'At most six temperatures.'),
  inverse: z.object({
    applications: z.number().int('A whole number of applications.').positive().max(1000).optional(),
    usable: volumeSchema.optional(),
  }).strict().optional(),
}).strict()
export type StudyInput = z.infer<typeof studyInputSchema>

export const studyListQuerySchema = z.object({
  q: z.string().trim().max(80).optional(),
  specificationId: z.coerce.number().int().positive().optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
})
