// Ice mass ↔ global mean sea level. Ocean area ≈ 3.62 × 10¹⁴ m² (Cogley 2012, "Area of the ocean",
// Marine Geodesy 35): 1 Gt of ice is about 1 km³ of water, so about 362 Gt raise the global mean by 1 mm.

export const GIGATONNES_PER_MILLIMETRE = 362

export function gigatonnesToMetres(gigatonnes: number): number {
  return gigatonnes / GIGATONNES_PER_MILLIMETRE / 1000
}

export function metresToGigatonnes(metres: number): number {
  return metres * 1000 * GIGATONNES_PER_MILLIMETRE
}
