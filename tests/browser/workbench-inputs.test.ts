// The workbench's inputs in a real browser against the real server: photos added to a reference set
// by drag-and-drop and the file picker on a wide screen (progress per photo and for the batch, a
// duplicate recognised, a file that is not a photo refused with the accepted types named), and by
// expo-image-picker's library and camera choices on a phone; several photos labelled at once on a
// phone; a gauge region drawn on the preview (a dragged rectangle and circle on a wide screen, two
// tapped corners on a phone), checked in the stored draft and in the gauge value the preview shows.
import type { BrowserContext, Locator, Page } from 'playwright-core';
import sharp from 'sharp';
import { UserEntity } from '../../server/components/auth/entities';
import { DefectKindEntity, PartTypeEntity } from '../../server/components/catalogue/entities';
import { DEMO_PASSWORD } from '../../server/seed/demo-users';
import type { Region } from '../../shared/rules/schema';
import { launchBrowser, PHONE, screenshot, startProduct, textsCutShort, watchErrors, WIDE, type RunningProduct } from '../support/browser';
import { spotPhoto } from '../support/photos';

jest.setTimeout(300_000);

const PART_TYPE = { code: 'inputs-plate', name: 'Inputs test plate', family: 'plate' };
const DEFECT_KINDS = [
  { code: 'scratch', name: 'Scratch' },
  { code: 'chip', name: 'Chip or notch' },
];

let product: RunningProduct;
let engineer: UserEntity;

beforeAll(async () => {
  product = await startProduct();
  const ds = product.db.dataSource;
  await ds.getRepository(PartTypeEntity).upsert(PART_TYPE, ['code']);
  await ds.getRepository(DefectKindEntity).upsert(DEFECT_KINDS, ['code']);
  engineer = await ds.getRepository(UserEntity).findOneByOrFail({ username: 'engineer' });
});
afterAll(() => product?.close());

/** Signs the engineer in, unless an earlier page of the same browser already did (the session is kept). */
async function signIn(page: Page): Promise<void> {
  await page.goto(`${product.url}/sign-in`);
  const userName = page.getByLabel('User name');
  const navigation = page.getByRole('navigation', { name: 'Main' });
  await userName.or(navigation).first().waitFor();
  if (await navigation.isVisible()) return;
  await userName.fill('engineer');
  await page.getByLabel('Password').fill(DEMO_PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await navigation.waitFor();
}

async function newSet(name: string, photos: { fileName: string; bytes: Buffer }[] = []): Promise<string> {
  const set = await product.services.references.createSet(engineer, { name, partType: PART_TYPE.code, description: '' });
  if (photos.length > 0) await product.services.references.addImages(engineer, set.id, photos);
  return set.id;
}

async function storedImages(setId: string): Promise<{ file_name: string; content_hash: string; label: string; defect_kind: string | null }[]> {
  return product.db.dataSource.query('select file_name, content_hash, label, defect_kind from reference_images where set_id = $1 order by file_name', [setId]);
}

const jpegPhoto = async (seed: number): Promise<Buffer> => sharp(await spotPhoto(seed, 6)).jpeg({ quality: 92 }).toBuffer();

/** One row of the upload list: the photo's name, then its status. */
function uploadRow(page: Page, fileName: string): Locator {
  return page.getByText(fileName, { exact: true }).locator('xpath=../..');
}

// ---- Drawing regions ---------------------------------------------------------------------------

/**
 * A 400×300 grey photo (level 40) with three bright blocks (level 230) of different sizes, so that
 * a region around one block gives that block's area as the largest blob, whatever the rounding of
 * the region's edge: A 100×60 = 6000 px², B 50×40 = 2000 px², C 30×20 = 600 px².
 */
const PHOTO = { width: 400, height: 300 };
const BLOCKS = {
  A: { x: 30, y: 40, w: 100, h: 60 },
  B: { x: 200, y: 60, w: 50, h: 40 },
  C: { x: 300, y: 200, w: 30, h: 20 },
};
async function blocksPhoto(): Promise<Buffer> {
  const px = Buffer.alloc(PHOTO.width * PHOTO.height, 40);
  for (const b of Object.values(BLOCKS)) for (let y = b.y; y < b.y + b.h; y++) px.fill(230, y * PHOTO.width + b.x, y * PHOTO.width + b.x + b.w);
  return sharp(px, { raw: { width: PHOTO.width, height: PHOTO.height, channels: 1 } }).png().toBuffer();
}

const GAUGE = 'Bright patch';
const BLOCKS_RULE = {
  format: 'kernwright-rule/1',
  name: 'Bright patch size',
  steps: [{ op: 'threshold', method: 'fixed', value: 128 }],
  gauges: [{ name: GAUGE, measure: 'largest-blob-area', unit: 'px2', limits: { max: 5000 } }],
};

/** A rule on its own reference set holding the blocks photo; returns the rule and its draft's ids. */
async function blocksRule(name: string): Promise<{ ruleId: string; versionId: string; setName: string }> {
  const setName = `${name} photos`;
  await newSet(setName, [{ fileName: 'blocks.png', bytes: await blocksPhoto() }]);
  const rule = await product.services.rules.create(engineer, { name, partType: PART_TYPE.code, smallestDefectMm: null, document: { ...BLOCKS_RULE, name } });
  return { ruleId: rule.id, versionId: rule.versions[0].id, setName };
}

async function openPreview(page: Page, ruleId: string, setName: string): Promise<Locator> {
  await page.goto(`${product.url}/rules/${ruleId}`);
  await page.getByText('Version 1 (draft) · saved').waitFor();
  await page.getByRole('radiogroup', { name: 'Reference set', exact: true }).getByRole('radio', { name: `${setName} (1 photo: 0 good, 0 defective, 1 unlabelled)` }).click();
  await page.getByRole('radio', { name: 'Photo blocks.png, unlabelled' }).click();
  await page.getByRole('heading', { name: /^Preview verdict: / }).waitFor({ timeout: 60_000 });
  return page.getByRole('img', { name: '1. Threshold output, large' });
}

/** Waits until the preview shows the gauge's value as `text`, e.g. "6000 px²". */
async function expectShownValue(page: Page, text: string): Promise<void> {
  const row = page.getByRole('table', { name: 'Gauge values' }).getByRole('row').filter({ hasText: GAUGE });
  await row.getByRole('cell', { name: text, exact: true }).waitFor();
}

/** A point of the photo (in its pixels) on the screen, where the canvas shows it. */
/** One screen pixel of the canvas as a fraction of the photo's width (pxX) and height (pxY). */
interface ScreenPoint { x: number; y: number; fx: number; fy: number; pxX: number; pxY: number }

async function screenPoint(canvas: Locator, photoX: number, photoY: number): Promise<ScreenPoint> {
  const box = (await canvas.boundingBox())!;
  // Whole screen pixels, as a finger or mouse lands; the fractions are what that point is of the photo.
  const x = Math.round(box.x + (photoX / PHOTO.width) * box.width);
  const y = Math.round(box.y + (photoY / PHOTO.height) * box.height);
  return { x, y, fx: (x - box.x) / box.width, fy: (y - box.y) / box.height, pxX: 1 / box.width, pxY: 1 / box.height };
}

async function storedRegion(versionId: string): Promise<Region | undefined> {
  const version = await product.services.rules.version(versionId);
  return (version.document as { gauges: { region?: Region }[] }).gauges[0].region;
}

/** Within one screen pixel of the canvas (the region is kept to 0.001 of the photo: half of that more). */
function expectNear(actual: number, expected: number, onePixel: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(onePixel + 0.0005);
}

/**
 * Opens the gauge and chooses the region's shape, which sets its default region (the middle of the photo), and waits
 * for the preview of it (`shownValue`): the new verdict above the photo can move the photo, so the
 * points of a drag are found after it.
 */
async function chooseShape(page: Page, shape: 'Rectangle' | 'Circle', shownValue: string): Promise<void> {
  // The saved gauge shows its summary until it is opened (once; it stays open).
  const edit = page.getByRole('button', { name: `Edit Gauge 1, ${GAUGE}` });
  if ((await edit.count()) > 0) await edit.click();
  await page.getByRole('radio', { name: shape }).click();
  await expectShownValue(page, shownValue);
}

/** Turns drawing on (its hint goes below the photo, which stays put) and brings the photo into view. */
async function startDrawing(page: Page, canvas: Locator): Promise<void> {
  const header = page.getByRole('radiogroup', { name: 'Zoom' });
  const gap = async () => (await canvas.boundingBox())!.y - (await header.boundingBox())!.y;
  const before = await gap();
  await page.getByRole('button', { name: `Draw the region of ${GAUGE} on the preview` }).click();
  await page.getByText(/Drag across the photo, or tap two opposite corners/).waitFor();
  // The hint goes below the photo: the photo has not moved away from the header above it.
  expect(await gap()).toBe(before);
  await canvas.scrollIntoViewIfNeeded();
}

async function saveDraft(page: Page): Promise<void> {
  await page.getByText(/has unsaved changes/).waitFor();
  await page.getByRole('button', { name: 'Save draft' }).click();
  await page.getByText('Version 1 (draft) · saved').waitFor();
}

describe('at wide width', () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await launchBrowser(WIDE);
  });
  afterAll(() => browser?.close());

  test('photos dropped on the set and chosen in the file picker: progress, a duplicate and a refused file', async () => {
    const setId = await newSet('Dropped photos');
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    await page.goto(`${product.url}/reference-sets/${setId}`);
    await page.getByText('No photos yet').waitFor();

    const first = await spotPhoto(1, 6);
    const files = [
      { name: 'plate-01.png', type: 'image/png', base64: first.toString('base64') },
      { name: 'plate-02.jpg', type: 'image/jpeg', base64: (await jpegPhoto(2)).toString('base64') },
      { name: 'plate-01-again.png', type: 'image/png', base64: first.toString('base64') },
      { name: 'shift-notes.txt', type: 'text/plain', base64: Buffer.from('Shift 2: press 3 changed tooling at 14:10.\n').toString('base64') },
    ];
    // Built in the page as a script string (the server's type-check has no DOM types).
    const dataTransfer = await page.evaluateHandle(`(() => {
      const transfer = new DataTransfer();
      for (const f of ${JSON.stringify(files)}) transfer.items.add(new File([Uint8Array.from(atob(f.base64), (c) => c.charCodeAt(0))], f.name, { type: f.type }));
      return transfer;
    })()`);

    // Hold the uploads until the progress bars have been seen (two requests run at a time).
    let release!: () => void;
    const held = new Promise<void>((resolve) => (release = resolve));
    await page.route('**/api/reference-sets/*/images', async (route) => {
      await held;
      await route.continue();
    });
    const dropZone = page.getByText('Drag photos here, or choose them');
    await dropZone.dispatchEvent('dragenter', { dataTransfer });
    await dropZone.dispatchEvent('dragover', { dataTransfer });
    await page.getByText('Drop the photos to add them').waitFor();
    await page.getByText('Drop the photos to add them').dispatchEvent('drop', { dataTransfer });

    await page.getByRole('progressbar', { name: 'All photos' }).waitFor();
    for (const f of files) await page.getByRole('progressbar', { name: `Upload of ${f.name}` }).waitFor();
    await page.getByText(/^Adding 4 photos: \d+ %$/).waitFor();
    await screenshot(page, 'references-uploading-wide');
    release();

    await page.getByText('Done: 2 stored, 1 already in the set, 1 refused').waitFor({ timeout: 60_000 });
    expect(await page.getByRole('progressbar', { name: 'All photos' }).getAttribute('aria-valuenow')).toBe('100');
    expect(await page.getByRole('progressbar', { name: /^Upload of / }).count()).toBe(0);
    await uploadRow(page, 'plate-02.jpg').getByText('✓ stored').waitFor();
    await uploadRow(page, 'plate-02.jpg').getByText('64×48, 8-bit').waitFor();
    // Two requests run at once, so either copy of the same photo may be the one stored first.
    await page.getByText('Already in this set: not stored twice.').waitFor();
    const refused = uploadRow(page, 'shift-notes.txt');
    await refused.getByText('✕ refused').waitFor();
    expect(await refused.textContent()).toMatch(/shift-notes\.txt: .*JPEG, PNG, TIFF or WebP/);
    await page.getByRole('button', { name: /^Label plate-01(-again)?\.png, \? unlabelled$/ }).waitFor();
    await screenshot(page, 'references-dropped-wide');

    let stored = await storedImages(setId);
    expect(stored).toHaveLength(2);
    expect(new Set(stored.map((s) => s.content_hash)).size).toBe(2);

    // The button opens the browser's file chooser; one new photo and one already in the set.
    await page.unroute('**/api/reference-sets/*/images');
    await page.getByRole('button', { name: 'Clear the list' }).click();
    const chooser = page.waitForEvent('filechooser');
    await page.getByRole('button', { name: 'Choose photos' }).click();
    const fileChooser = await chooser;
    expect(fileChooser.isMultiple()).toBe(true);
    await fileChooser.setFiles([
      { name: 'plate-03.png', mimeType: 'image/png', buffer: await spotPhoto(3, 8) },
      { name: 'plate-02-copy.jpg', mimeType: 'image/jpeg', buffer: Buffer.from(files[1].base64, 'base64') },
    ]);
    await page.getByText('Done: 1 stored, 1 already in the set').waitFor({ timeout: 60_000 });
    await uploadRow(page, 'plate-03.png').getByText('✓ stored').waitFor();
    await page.getByRole('button', { name: 'Label plate-03.png, ? unlabelled' }).waitFor();
    stored = await storedImages(setId);
    expect(stored.map((s) => s.file_name)).toContain('plate-03.png');
    expect(stored).toHaveLength(3);

    // The hidden input itself, as a script or an assistive tool would fill it.
    await page.getByRole('button', { name: 'Clear the list' }).click();
    await page.getByLabel('Photos to add').setInputFiles([{ name: 'plate-04.jpg', mimeType: 'image/jpeg', buffer: await jpegPhoto(4) }]);
    await page.getByText('Done: 1 stored').waitFor({ timeout: 60_000 });
    expect(await storedImages(setId)).toHaveLength(4);
    await page.getByText(/4 photos: 0 good, 0 defective, 0 retake, 4 unlabelled/).waitFor();
    await screenshot(page, 'references-picked-wide');
    expect(errors).toEqual([]);
    await page.close();
  });

  test('a rectangle and a circle dragged on the preview become the gauge region', async () => {
    const { ruleId, versionId, setName } = await blocksRule('Drawn regions wide');
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    const canvas = await openPreview(page, ruleId, setName);
    // No region: the largest blob of the whole photo is block A (100×60 px, by construction).
    await expectShownValue(page, '6000 px²');
    await page.getByRole('heading', { name: 'Preview verdict: FAIL' }).waitFor();

    // A rectangle dragged around block B with the mouse.
    await chooseShape(page, 'Rectangle', '1250 px²');
    await startDrawing(page, canvas);
    const from = await screenPoint(canvas, BLOCKS.B.x - 15, BLOCKS.B.y - 15);
    const to = await screenPoint(canvas, BLOCKS.B.x + BLOCKS.B.w + 15, BLOCKS.B.y + BLOCKS.B.h + 15);
    await page.mouse.move(from.x, from.y);
    await page.mouse.down();
    await page.mouse.move((from.x + to.x) / 2, (from.y + to.y) / 2, { steps: 4 });
    await page.mouse.move(to.x, to.y, { steps: 4 });
    // Measured inside the region under the pointer before it is let go: block B alone, in the table
    // and under the photo (where a phone still shows it while the finger drags).
    await expectShownValue(page, '2000 px²');
    await page.getByText(/^Inside this region: .* 2000 px², ✓ within limits$/).waitFor();
    await page.mouse.up();
    // Block B alone: 50×40 px, within the limit.
    await expectShownValue(page, '2000 px²');
    await page.getByRole('heading', { name: 'Preview verdict: PASS' }).waitFor();
    // Only the gauge changed: measured again on the last run's images, the pipeline not run again.
    await page.getByText(/^Gauges measured again on the same images in \d+ ms/).waitFor();
    await page.getByRole('button', { name: `Draw the region of ${GAUGE} on the preview` }).waitFor();
    await screenshot(page, 'workbench-region-rect-wide');
    await page.getByRole('table', { name: 'Gauge values' }).scrollIntoViewIfNeeded();
    await screenshot(page, 'workbench-region-value-wide');
    await saveDraft(page);
    const rect = await storedRegion(versionId);
    expect(rect?.shape).toBe('rect');
    if (rect?.shape !== 'rect') return;
    expectNear(rect.x, from.fx, from.pxX);
    expectNear(rect.y, from.fy, from.pxY);
    expectNear(rect.w, to.fx - from.fx, 2 * from.pxX);
    expectNear(rect.h, to.fy - from.fy, 2 * from.pxY);

    // A circle dragged as the square around block C: the circle inside that square.
    await chooseShape(page, 'Circle', '1756 px²');
    await startDrawing(page, canvas);
    const centre = { x: BLOCKS.C.x + BLOCKS.C.w / 2, y: BLOCKS.C.y + BLOCKS.C.h / 2 };
    const corner1 = await screenPoint(canvas, centre.x - 35, centre.y - 35);
    const corner2 = await screenPoint(canvas, centre.x + 35, centre.y + 35);
    await page.mouse.move(corner1.x, corner1.y);
    await page.mouse.down();
    await page.mouse.move(corner2.x, corner2.y, { steps: 6 });
    await page.mouse.up();
    // Block C alone: 30×20 px.
    await expectShownValue(page, '600 px²');
    await screenshot(page, 'workbench-region-circle-wide');
    await saveDraft(page);
    const circle = await storedRegion(versionId);
    expect(circle?.shape).toBe('circle');
    if (circle?.shape !== 'circle') return;
    expectNear(circle.cx, (corner1.fx + corner2.fx) / 2, corner1.pxX);
    expectNear(circle.cy, (corner1.fy + corner2.fy) / 2, corner1.pxY);
    // r is a fraction of the photo's shorter side (DESIGN.md, rule file format), the height here:
    // half the dragged square's height.
    expectNear(circle.r, (corner2.fy - corner1.fy) / 2, corner1.pxY);
    expect(errors).toEqual([]);
    await page.close();
  });
});

describe('at phone width', () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await launchBrowser(PHONE);
  });
  afterAll(() => browser?.close());

  test('the library and camera choices open a file input whose photos are added', async () => {
    const setId = await newSet('Phone photos');
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    await page.goto(`${product.url}/reference-sets/${setId}`);
    await page.getByText('No photos yet').waitFor();
    // A phone has no drop zone: the photo sources are the library and the camera.
    expect(await page.getByText('Drag photos here, or choose them').count()).toBe(0);

    const library = page.waitForEvent('filechooser');
    await page.getByRole('button', { name: 'Choose from library' }).click();
    const libraryChooser = await library;
    expect(libraryChooser.isMultiple()).toBe(true);
    await libraryChooser.setFiles([
      { name: 'bench-01.png', mimeType: 'image/png', buffer: await spotPhoto(11, 6) },
      { name: 'bench-02.jpg', mimeType: 'image/jpeg', buffer: await jpegPhoto(12) },
    ]);
    await page.getByText('Done: 2 stored').waitFor({ timeout: 60_000 });
    await page.getByRole('button', { name: 'Label bench-02.jpg, ? unlabelled' }).waitFor();

    await page.getByRole('button', { name: 'Clear the list' }).click();
    const camera = page.waitForEvent('filechooser');
    await page.getByRole('button', { name: 'Take a photo' }).click();
    const cameraChooser = await camera;
    expect(cameraChooser.isMultiple()).toBe(false);
    expect(await cameraChooser.element().getAttribute('capture')).not.toBeNull();
    await cameraChooser.setFiles([{ name: 'bench-03.png', mimeType: 'image/png', buffer: await spotPhoto(13, 9) }]);
    await page.getByText('Done: 1 stored').waitFor({ timeout: 60_000 });
    await page.getByRole('button', { name: 'Label bench-03.png, ? unlabelled' }).waitFor();
    expect((await storedImages(setId)).map((s) => s.file_name)).toEqual(['bench-01.png', 'bench-02.jpg', 'bench-03.png']);
    await screenshot(page, 'references-added-phone');

    // A file the picker cannot read as a photo is named, not lost without a word.
    await page.getByRole('button', { name: 'Clear the list' }).click();
    const again = page.waitForEvent('filechooser');
    await page.getByRole('button', { name: 'Choose from library' }).click();
    await (await again).setFiles([{ name: 'shift-notes.txt', mimeType: 'text/plain', buffer: Buffer.from('not a photo\n') }]);
    await page.getByText(/could not be read as a photo\. Choose PNG, JPEG, TIFF or WebP photos/).waitFor();
    await screenshot(page, 'references-picker-refused-phone');
    expect(await storedImages(setId)).toHaveLength(3);
    expect(errors).toEqual([]);
    await page.close();
  });

  test('several photos labelled defective with a defect kind at once', async () => {
    const photos = await Promise.all([21, 22, 23, 24].map(async (seed) => ({ fileName: `lot-${seed}.png`, bytes: await spotPhoto(seed, 5) })));
    const setId = await newSet('Phone labelling', photos);
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    await page.goto(`${product.url}/reference-sets/${setId}`);
    await page.getByRole('button', { name: 'Label lot-21.png, ? unlabelled' }).waitFor();

    await page.getByRole('button', { name: 'Select photos' }).click();
    for (const seed of [21, 22, 24]) await page.getByRole('checkbox', { name: `Select lot-${seed}.png, ? unlabelled` }).click();
    await page.getByText('3 selected').waitFor();
    for (const seed of [21, 22, 24]) expect(await page.getByRole('checkbox', { name: `Select lot-${seed}.png, ? unlabelled` }).getAttribute('aria-checked')).toBe('true');
    expect(await page.getByRole('checkbox', { name: 'Select lot-23.png, ? unlabelled' }).getAttribute('aria-checked')).toBe('false');
    await screenshot(page, 'references-selected-phone');
    await page.getByRole('button', { name: 'Label 3 photos' }).click();

    const dialog = page.locator('[role="dialog"][aria-labelledby]');
    await dialog.getByText('Label 3 photos').first().waitFor();
    await dialog.getByRole('radio', { name: 'Defective' }).click();
    await dialog.getByRole('radio', { name: 'Chip or notch' }).click();
    await screenshot(page, 'references-label-dialog-phone');
    await dialog.getByRole('button', { name: 'Label 3 photos' }).click();
    await page.getByText('✓ Labelled 3 photos.').waitFor();
    const tile = page.getByRole('button', { name: 'Label lot-24.png, ✕ defective (Chip or notch)' });
    await tile.waitFor();
    // The tile shows the defect kind whole, not cut short after the label.
    const kind = tile.getByText('Chip or notch', { exact: true });
    await kind.waitFor();
    expect(await textsCutShort(kind)).toEqual([]);
    await page.getByText(/4 photos: 0 good, 3 defective, 0 retake, 1 unlabelled/).waitFor();
    await screenshot(page, 'references-labelled-phone');

    const stored = await storedImages(setId);
    expect(stored.map((s) => [s.file_name, s.label, s.defect_kind])).toEqual([
      ['lot-21.png', 'defective', 'chip'],
      ['lot-22.png', 'defective', 'chip'],
      ['lot-23.png', 'unlabelled', null],
      ['lot-24.png', 'defective', 'chip'],
    ]);
    expect(errors).toEqual([]);
    await page.close();
  });

  test("a rule document's 15×15 matrix: its size among the choices, its grid scrolling sideways inside the card", async () => {
    // The grid offers 1–9 a side; a rule document may hold up to 31 (a rule written by a script).
    const name = 'Wide matrix phone';
    const matrix = Array.from({ length: 15 }, (_, j) => Array.from({ length: 15 }, (_, i) => (i === 7 && j === 7 ? 1 : i - 7)));
    const rule = await product.services.rules.create(engineer, {
      name,
      partType: PART_TYPE.code,
      smallestDefectMm: null,
      document: { ...BLOCKS_RULE, name, steps: [...BLOCKS_RULE.steps, { op: 'kernel', matrix }] },
    });
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    await page.goto(`${product.url}/rules/${rule.id}`);
    // A saved step shows its summary until it is opened.
    await page.getByText('15×15 matrix ÷ 1').waitFor();
    expect(await page.getByLabel('Step 2: Kernel, weights, 15 rows by 15 columns').count()).toBe(0);
    await page.getByRole('button', { name: 'Edit Step 2: Kernel' }).click();
    // Each field says its step: several steps can be open at once.
    const grid = page.getByLabel('Step 2: Kernel, weights, 15 rows by 15 columns');
    await grid.waitFor();
    // Both groups offer the same numbers: each chip says which it sizes ("15 rows", "15 columns").
    for (const size of ['Rows', 'Columns']) expect(await page.getByRole('radiogroup', { name: `Step 2: Kernel, ${size}` }).getByRole('radio', { name: `15 ${size.toLowerCase()}` }).getAttribute('aria-checked')).toBe('true');
    await page.getByText('15 columns: the grid scrolls sideways.').waitFor();
    const divisor = page.getByRole('textbox', { name: 'Step 2: Kernel, Divisor', exact: true });
    await divisor.scrollIntoViewIfNeeded();
    const before = (await divisor.boundingBox())!;
    const phoneWidth = page.viewportSize()!.width;
    expect(before.x + before.width).toBeLessThanOrEqual(phoneWidth);
    // The last column comes into view by scrolling the grid; the rest of the card stays where it was.
    const lastCell = page.getByLabel('Step 2: Kernel, weight row 8 column 15');
    await lastCell.scrollIntoViewIfNeeded();
    const cell = (await lastCell.boundingBox())!;
    expect(cell.x).toBeGreaterThanOrEqual(0);
    expect(cell.x + cell.width).toBeLessThanOrEqual(phoneWidth);
    expect(await lastCell.inputValue()).toBe('7');
    expect((await divisor.boundingBox())!.x).toBe(before.x);
    await screenshot(page, 'workbench-wide-matrix-phone');
    expect(errors).toEqual([]);
    await page.close();
  });

  test('a rectangle set by tapping two corners on the preview becomes the gauge region', async () => {
    const { ruleId, versionId, setName } = await blocksRule('Drawn regions phone');
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page);
    const canvas = await openPreview(page, ruleId, setName);
    await expectShownValue(page, '6000 px²');

    await chooseShape(page, 'Rectangle', '1250 px²');
    await startDrawing(page, canvas);
    const a = await screenPoint(canvas, BLOCKS.C.x + BLOCKS.C.w + 15, BLOCKS.C.y - 15);
    const b = await screenPoint(canvas, BLOCKS.C.x - 15, BLOCKS.C.y + BLOCKS.C.h + 15);
    // Real touches (a phone's finger), through the browser's input layer.
    const cdp = await page.context().newCDPSession(page);
    await cdp.send('Emulation.setTouchEmulationEnabled', { enabled: true, maxTouchPoints: 1 });
    const tap = async (p: { x: number; y: number }) => {
      await cdp.send('Input.dispatchTouchEvent', { type: 'touchStart', touchPoints: [{ x: p.x, y: p.y }] });
      await cdp.send('Input.dispatchTouchEvent', { type: 'touchEnd', touchPoints: [] });
    };
    await tap(a);
    await screenshot(page, 'workbench-region-first-corner-phone');
    await tap(b);
    // Block C alone: 30×20 px.
    await expectShownValue(page, '600 px²');
    await page.getByRole('heading', { name: 'Preview verdict: PASS' }).waitFor();
    await screenshot(page, 'workbench-region-rect-phone');
    await page.getByRole('table', { name: 'Gauge values' }).scrollIntoViewIfNeeded();
    await screenshot(page, 'workbench-region-value-phone');
    await saveDraft(page);
    const rect = await storedRegion(versionId);
    expect(rect?.shape).toBe('rect');
    if (rect?.shape !== 'rect') return;
    expectNear(rect.x, b.fx, b.pxX);
    expectNear(rect.y, a.fy, a.pxY);
    expectNear(rect.w, a.fx - b.fx, 2 * a.pxX);
    expectNear(rect.h, b.fy - a.fy, 2 * a.pxY);
    expect(errors).toEqual([]);
    await page.close();
  });
});
