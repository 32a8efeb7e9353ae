import type { FieldReference } from '../types/field'
import type { InstalledUnitDto } from '../types/fleet'

/**
 * The device's station copy is refreshed by what changed. The units are split into buckets by id
 * (`id mod UNIT_BUCKETS`); the device sends a digest of each bucket it holds and of its
 * specifications and tools, and the server answers only the buckets and sections whose digest
 * differs from its own. Correct by construction: a digest covers everything the device is given
 * about an item (its unit, aircraft, specification link and alerts), so nothing has to track why
 * an item changed. The digest is not a security measure (the server recomputes everything it
 * stores); a 53-bit hash leaves a stale bucket with odds of about 1 in 10^15 per change.
 */
export const UNIT_BUCKETS = 64

/** cyrb53: a fast 53-bit string hash (public domain, bryc), the same in the browser and on the server. */
function hash53(text: string): string {
  let h1 = 0xDEADBEEF
  let h2 = 0x41C6CE57
  for (let index = 0; index < text.length; index++) {
    const code = text.charCodeAt(index)
    h1 = Math.imul(h1 ^ code, 2654435761)
    h2 = Math.imul(h2 ^ code, 1597334677)
  }
  h1 = Math.imul(h1 ^ (h1 >>> 16), 2246822507) ^ Math.imul(h2 ^ (h2 >>> 13), 3266489909)
  h2 = Math.imul(h2 ^ (h2 >>> 16), 2246822507) ^ Math.imul(h1 ^ (h1 >>> 13), 3266489909)
  return (4294967296 * (2097151 & h2) + (h1 >>> 0)).toString(36)
}

const digestOf = (items: { id: number }[]) =>
  hash53(JSON.stringify([...items].sort((a, b) => a.id - b.id)))

export const bucketOf = (unitId: number) => unitId % UNIT_BUCKETS

/** The units of each bucket, in id order. */
function bucketed(units: InstalledUnitDto[]): InstalledUnitDto[][] {
  const buckets: InstalledUnitDto[][] = Array.from({ length: UNIT_BUCKETS }, () => [])
  for (const unit of units) buckets[bucketOf(unit.id)]!.push(unit)
  return buckets
}

export interface ReferenceDigests {
  units: string[]
  specifications: string
  tools: string
}

export function referenceDigests(reference: Pick<FieldReference, 'units' | 'specifications' | 'tools'>): ReferenceDigests {
  return {
    units: bucketed(reference.units).map(digestOf),
    specifications: digestOf(reference.specifications),
    tools: digestOf(reference.tools),
  }
}

/** The digests as the device sends them: query parameters. */
export function digestQuery(digests: ReferenceDigests): Record<string, string> {
  return { units: digests.units.join('.'), specifications: digests.specifications, tools: digests.tools }
}

/** The answer to a device that sent its digests: only what differs. */
export interface FieldReferenceUpdate extends Omit<FieldReference, 'units' | 'specifications' | 'tools'> {
  /** The buckets whose units changed, each whole (an empty list: that bucket is now empty). */
  unitBuckets: Record<number, InstalledUnitDto[]>
  /** Left out when the device's are current. */
  specifications?: FieldReference['specifications']
  tools?: FieldReference['tools']
}

/** The server's side: what a device holding `known` needs of `reference`. */
export function referenceUpdate(reference: FieldReference, known: ReferenceDigests): FieldReferenceUpdate {
  const { units, specifications, tools, ...rest } = reference
  const mine = referenceDigests(reference)
  const buckets = bucketed(units)
  const update: FieldReferenceUpdate = { ...rest, unitBuckets: {} }
  mine.units.forEach((digest, bucket) => {
    if (digest !== known.units[bucket]) update.unitBuckets[bucket] = buckets[bucket]!
  })
  if (mine.specifications !== known.specifications) update.specifications = specifications
  if (mine.tools !== known.tools) update.tools = tools
  return update
}

/** The device's side: its copy with the update applied (units kept in the order the server lists them). */
export function applyReferenceUpdate(held: FieldReference, update: FieldReferenceUpdate): FieldReference {
  const { unitBuckets, specifications, tools, ...rest } = update
  const replaced = new Set(Object.keys(unitBuckets).map(Number))
  const units = [
    ...held.units.filter(unit => !replaced.has(bucketOf(unit.id))),
    ...Object.values(unitBuckets).flat(),
  ].sort((a, b) =>
    (a.aircraft?.registration ?? '').localeCompare(b.aircraft?.registration ?? '')
    || (a.position ?? '').localeCompare(b.position ?? '')
    || a.id - b.id)
  return {
    ...rest,
    units,
    specifications: specifications ?? held.specifications,
    tools: tools ?? held.tools,
  }
}
