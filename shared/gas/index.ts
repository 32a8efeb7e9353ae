/**
 * Chargewell's gas-law engine: pure functions, SI inside, explicit units at the edges.
 * Imported by pages and server routes alike; no framework, database or browser imports.
 */
export * from './types'
export * from './errors'
export * from './version'
export * from './units'
export * from './format'
export * from './atmosphere'
export * from './gas-law'
export * from './nitrogen'
export * from './charge-target'
export * from './usable-volume'
export * from './leakage'
