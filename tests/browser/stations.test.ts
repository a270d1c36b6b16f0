// A supervisor sets up a station at phone and wide widths: a new line, a station on it with a camera
// note, then its calibration from a photo of a 10 mm gauge block, with two edges marked on the photo.
// The scale and its quantisation uncertainty are checked against values worked out by hand for the photo.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import sharp from 'sharp';
import { launchBrowser, PHONE, screenshot, startProduct, watchErrors, WIDE, type RunningProduct, signInAs } from '../support/browser';

/** The open dialog's panel (react-native-web's Modal wraps it in a second, unnamed dialog element). */
function openDialog(page: Page) {
  return page.locator('[role="dialog"][aria-labelledby]');
}

jest.setTimeout(300_000);

// The target photo: a dark gauge block on a light board, its left edge between pixel columns 299
// and 300 and its right edge between 699 and 700, so its faces are exactly 400 px apart.
const PHOTO = { width: 1200, height: 900 };
const BLOCK = { left: 300, right: 700, top: 300, bottom: 600 };
const BLOCK_MM = 10;
// REFERENCES.md §8 (calibration basics, worked example): 10.00 mm over 400.0 px is 0.025 mm/px.
const EXPECTED_SCALE = '0.025 mm/px';
// The scale holds only for photos of the target photo's size (common practice; DESIGN.md's quality gate: size).
const EXPECTED_CALIBRATION = `${EXPECTED_SCALE} for ${PHOTO.width}×${PHOTO.height} photos`;
// One pixel's quantisation, s/√12 (GUM JCGM 100:2008 §F.2.2.1, rectangular distribution; from memory):
// 0.025 / 3.4641 = 0.0072169 mm, shown to three significant figures, written "u = …" and not "±…": the
// GUM keeps ± for an interval of stated coverage (JCGM 100:2008 §7.2.2; from memory).
const EXPECTED_UNCERTAINTY_MM = '0.00722 mm';
const EXPECTED_UNCERTAINTY = `u = ${EXPECTED_UNCERTAINTY_MM}`;

let product: RunningProduct;
let photoFile: string;

async function targetPhoto(file: string): Promise<void> {
  const pixels = Buffer.alloc(PHOTO.width * PHOTO.height, 210);
  for (let y = BLOCK.top; y < BLOCK.bottom; y++) pixels.fill(40, y * PHOTO.width + BLOCK.left, y * PHOTO.width + BLOCK.right);
  await sharp(pixels, { raw: { width: PHOTO.width, height: PHOTO.height, channels: 1 } }).png().toFile(file);
}

beforeAll(async () => {
  product = await startProduct();
  photoFile = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'kw-stations-')), 'gauge-block-10mm.png');
  await targetPhoto(photoFile);
});
afterAll(async () => {
  await product?.close();
  if (photoFile) fs.rmSync(path.dirname(photoFile), { recursive: true, force: true });
});

const signIn = (page: Page) => signInAs(page, product.url, 'supervisor');

/** Taps the photo where a photo pixel is shown, a few pixels off the edge as a finger would be. */
async function tapPhotoAt(page: Page, x: number, y: number): Promise<void> {
  const box = (await page.getByRole('button', { name: /^Photo of the calibration target/ }).boundingBox())!;
  await page.mouse.click(box.x + (x * box.width) / PHOTO.width, box.y + (y * box.height) / PHOTO.height);
}

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('the supervisor at %s width', (widthName, viewport) => {
  const lineName = `Line 9 — gauge room (${widthName})`;
  const stationName = `Bench camera ${widthName}`;
  const cameraNote = '5 MP mono camera, 35 mm lens, backlight; photos at 1200×900';
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];

  beforeAll(async () => {
    browser = await launchBrowser(viewport);
    page = await browser.newPage();
    errors = watchErrors(page);
    await signIn(page);
  });
  afterAll(() => browser?.close());

  test('creates a line and a station on it with a camera note', async () => {
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Stations' }).click();
    await page.getByRole('button', { name: 'New line' }).click();
    const lineDialog = openDialog(page);
    await lineDialog.getByLabel('Line name').fill(lineName);
    await lineDialog.getByRole('button', { name: 'Add line' }).click();
    await lineDialog.waitFor({ state: 'hidden' });

    await page.getByRole('button', { name: `Add a station to ${lineName}` }).click();
    const stationDialog = openDialog(page);
    await stationDialog.getByLabel('Station name').fill(stationName);
    await stationDialog.getByLabel('Camera note').fill(cameraNote);
    await screenshot(page, `stations-new-station-${widthName}`);
    // The line the button belongs to is already chosen (ticked).
    expect(await stationDialog.getByRole('radio', { name: lineName }).textContent()).toBe(`✓ ${lineName}`);
    await stationDialog.getByRole('button', { name: 'Add station' }).click();
    await stationDialog.waitFor({ state: 'hidden' });

    await page.getByText(cameraNote).first().waitFor();
    await page.getByRole('button', { name: `Calibrate ${stationName}` }).waitFor();
    const [row] = await product.db.dataSource.query(`select s.camera_note, s.mm_per_px, l.name as line from stations s join lines l on l.id = s.line_id where s.name = $1`, [stationName]);
    expect(row).toEqual({ camera_note: cameraNote, mm_per_px: null, line: lineName });
    await screenshot(page, `stations-list-${widthName}`);
  });

  test('calibrates the station from a photo of a 10 mm gauge block with two edges marked', async () => {
    await page.getByRole('button', { name: `Calibrate ${stationName}` }).click();
    await page.getByText('⚠ Not calibrated: gauges in mm and mm² cannot be measured here yet.').waitFor();
    await page.getByLabel('Known length of the target (mm)').fill(String(BLOCK_MM));
    const chooser = page.waitForEvent('filechooser');
    await page.getByRole('button', { name: 'Choose a photo of the target' }).click();
    await (await chooser).setFiles(photoFile);

    // Taps a little beside each face; the marks move onto the edges along the line between them.
    await tapPhotoAt(page, BLOCK.left + 5, 450);
    await tapPhotoAt(page, BLOCK.right - 6, 452);
    await page.getByText(/^✓ A and B moved onto the edges nearest your taps/).waitFor();
    expect(await page.getByLabel('Distance between the two edges (px)').inputValue()).toBe('400.0');
    // The photo size comes from the target's photo; the screen refuses a size that is not whole pixels.
    const width = page.getByLabel('Photo width (px)');
    expect(await width.inputValue()).toBe(String(PHOTO.width));
    expect(await page.getByLabel('Photo height (px)').inputValue()).toBe(String(PHOTO.height));
    await width.fill('1200.5');
    await page.getByRole('button', { name: 'Save calibration' }).click();
    await page.getByText('Enter the photos’ width in whole pixels').waitFor();
    await width.fill(String(PHOTO.width));
    const result = page.getByRole('status').filter({ hasText: 'Standard uncertainty from one pixel’s quantisation' });
    await result.getByText(EXPECTED_CALIBRATION, { exact: true }).waitFor();
    await result.getByText(`Standard uncertainty from one pixel’s quantisation, u = s/√12 = ${EXPECTED_UNCERTAINTY_MM}`).waitFor();
    await result.scrollIntoViewIfNeeded();
    await screenshot(page, `stations-calibration-marked-${widthName}`);

    await page.getByRole('button', { name: 'Save calibration' }).click();
    const confirm = openDialog(page);
    await confirm.getByText(`${stationName} will measure at ${EXPECTED_CALIBRATION}.`, { exact: false }).waitFor();
    await confirm.getByRole('button', { name: 'Save calibration' }).click();
    await confirm.waitFor({ state: 'hidden' });
    const saved = page.getByText(/^✓ Calibration saved/);
    await saved.waitFor();
    await page.getByText(`${EXPECTED_CALIBRATION} · quantisation ${EXPECTED_UNCERTAINTY}`).waitFor();
    await page.getByText(/^Calibrated by Mara Lindqvist on /).waitFor();
    // The form closes up after saving, so the confirmation is in view where the person was.
    expect(await page.getByRole('button', { name: /^Photo of the calibration target/ }).count()).toBe(0);
    expect(await saved.isVisible()).toBe(true);
    const box = (await saved.boundingBox())!;
    expect(box.y).toBeGreaterThanOrEqual(0);
    expect(box.y + box.height).toBeLessThanOrEqual(viewport.height);
    await screenshot(page, `stations-calibrated-${widthName}`);

    const [row] = await product.db.dataSource.query(`select s.mm_per_px, s.photo_width_px, s.photo_height_px, u.username from stations s join users u on u.id = s.calibrated_by where s.name = $1`, [stationName]);
    expect(row.mm_per_px).toBeCloseTo(0.025, 12);
    expect([row.photo_width_px, row.photo_height_px]).toEqual([PHOTO.width, PHOTO.height]);
    expect(row.username).toBe('supervisor');
    expect(errors).toEqual([]);
  });

  test('the stations list shows the new calibration with who set it', async () => {
    await page.getByRole('button', { name: 'Back to stations' }).click();
    const card = page.getByText(`${EXPECTED_CALIBRATION} · quantisation ${EXPECTED_UNCERTAINTY}`);
    await card.first().waitFor();
    expect(await page.getByText(/^Calibrated by Mara Lindqvist on /).count()).toBeGreaterThan(0);
    await screenshot(page, `stations-list-calibrated-${widthName}`);
  });
});
