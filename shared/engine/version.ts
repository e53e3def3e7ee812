/**
 * Changes whenever the same input and seed would give different numbers (block size, random
 * stream, score generation, statistics). Stored with every outlook and part of its input hash.
 */
export const ENGINE_VERSION = 'brinkwater-engine/6'
