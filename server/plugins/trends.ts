import { trendAfterSpecificationChange } from '../services/trends'

/** The stored trends follow the specifications: a change re-flags the units of its part number. */
export default defineNitroPlugin(() => {
  onSpecificationChanged(trendAfterSpecificationChange)
})
