/** Bumped whenever a result for the same input could change. Frozen into every stored record. */
export const ENGINE_VERSION = '1.0.0'
