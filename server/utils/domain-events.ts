/**
 * Changes one part of the domain announces and another follows, without importing it: a specification
 * change (its figures, threshold or check interval) re-flags the units of its part number, in the
 * trends service, which itself reads the specifications (an import each way was a loop). Listeners are
 * registered by server plugins and run after the announcing write has committed.
 */
type SpecificationListener = (partNumber: string) => Promise<void>
const specificationListeners: SpecificationListener[] = []

export function onSpecificationChanged(listener: SpecificationListener): void {
  specificationListeners.push(listener)
}

/** A part number's current specification changed (its write committed): every listener follows, in turn. */
export async function specificationChanged(partNumber: string): Promise<void> {
  for (const listener of specificationListeners) await listener(partNumber)
}
