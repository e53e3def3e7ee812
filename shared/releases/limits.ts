// Upload limits, stated to the analyst in the editor and in every refusal.
export const CSV_MAX_BYTES = 8 * 1024 * 1024
export const MAX_UPLOADED_DRAWS = 100_000
export const MAX_ANCHOR_YEARS = 60
export const MAX_QUANTILE_LEVELS = 199
/** Draws × anchor years: bounds the engine's work and memory for one preview or save (100,000 draws × 20 years). */
export const MAX_DRAW_VALUES = 2_000_000
export const MAX_TEXT = { title: 160, method: 4000, citation: 1000, licence: 200, reason: 1000, note: 2000 } as const
