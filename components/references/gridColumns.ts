// How wide a reference set's photo tiles are: as many columns as fit, sharing the row's whole width.

/** Tiles are at least this wide. */
export const TILE_MIN_WIDTH = 150;

/** The width of each of the columns that fit `width` (tiles at least TILE_MIN_WIDTH, `gap` between them). */
export function tileWidth(width: number, gap: number): number {
  const columns = Math.max(1, Math.floor((width + gap) / (TILE_MIN_WIDTH + gap)));
  return Math.floor((width - gap * (columns - 1)) / columns);
}
