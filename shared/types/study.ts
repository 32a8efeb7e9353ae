import type { StudyInput } from '../schemas/study'
import type { StudyResults } from '../utils/study'

/** A saved sizing study: its inputs and the results the server computed and froze with the engine version. */
export interface StudyDto {
  id: number
  name: string
  specificationId: number | null
  inputs: StudyInput
  results: StudyResults
  engineVersion: string
  createdAt: string
  updatedAt: string
}

/** One row of the study list. */
export interface StudyListItem {
  id: number
  name: string
  specification: string | null
  engineVersion: string
  updatedAt: string
  author: string
}
