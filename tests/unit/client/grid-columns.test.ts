// Reference photo tiles fill each row: as many columns of at least 150 px as fit, the row's width shared.
import { TILE_MIN_WIDTH, tileWidth } from '../../../components/references/gridColumns';

test('a phone row (358 px, 8 px gaps) holds two tiles of 175 px', () => {
  expect(tileWidth(358, 8)).toBe(175);
});

test('a wide row holds as many as fit, never narrower than the minimum', () => {
  const width = 968;
  const tile = tileWidth(width, 8);
  const columns = Math.floor((width + 8) / (tile + 8));
  expect(columns).toBe(6);
  expect(tile).toBeGreaterThanOrEqual(TILE_MIN_WIDTH);
  expect(columns * tile + (columns - 1) * 8).toBeLessThanOrEqual(width);
});

test('a row narrower than one tile holds one tile of its whole width', () => {
  expect(tileWidth(120, 8)).toBe(120);
});
