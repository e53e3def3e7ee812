// How the PDF cuts a table's rows into pieces that each stay on one page (with the header repeated):
// a header is never left at the foot of a page and a row never stands alone on one.

/** Rows a piece holds at most: always less than a page, even with citations of several lines. */
export const ROWS_PER_PIECE = 12

/** Sizes of the pieces: at most `most` rows each, as even as possible, so never a piece of one row. */
export function pieceSizes(rows: number, most = ROWS_PER_PIECE): number[] {
  if (rows <= most) return [rows]
  const count = Math.ceil(rows / most)
  const base = Math.floor(rows / count)
  return Array.from({ length: count }, (_, i) => base + (i < rows % count ? 1 : 0))
}
