import type { Transaction } from 'sequelize'
import { Specification, SpecificationTablePoint } from '../models'

/**
 * A part number's current specification, with its approved-data table points: the one lookup every
 * service uses (re-exported by services/specifications.ts), kept below them so the trend store and the
 * scale benchmark's builder, which run outside Nitro too, can use it.
 */
export function currentSpecification(partNumber: string, transaction?: Transaction): Promise<Specification | null> {
  return Specification.findOne({
    where: { partNumber, status: 'current' },
    include: [{ model: SpecificationTablePoint, as: 'tablePoints' }],
    transaction,
  })
}
