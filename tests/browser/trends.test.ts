// The supervisor's Trends area in a real browser against the real server, at phone and wide width:
// the p-chart with its control limits and signals (the same as the server's chart), the same numbers
// as a table, a cause of the Pareto opening exactly its failed inspections, a second alert limit for
// the same rule refused where it can be read, an alert acknowledged with a note, and a repeatability
// study of one part run from the browser.
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import { generateDataset } from '../../server/demo';
import { DEMO_FRAME } from '../../server/seed/demo-plant';
import { UserEntity } from '../../server/components/auth/entities';
import type { PChart, Pareto } from '../../shared/api/trends';
import { inSight, launchBrowser, PHONE, screenshot, seedPlantIntoProduct, startProduct, textsCutShort, watchErrors, WIDE, type RunningProduct, signInAs } from '../support/browser';

jest.setTimeout(600_000);

const DAY_MS = 86_400_000;

let product: RunningProduct;
let chart: PChart;
let pareto: Pareto;
let photoDir: string;
/** The same good washer photographed three times (three files of one image). */
const samePartPhotos: string[] = [];

/** The screen's first range: the last 30 whole UTC days up to the end of today. */
function defaultRange(): { from: string; to: string } {
  const end = Math.floor(Date.now() / DAY_MS) * DAY_MS + DAY_MS;
  return { from: new Date(end - 30 * DAY_MS).toISOString(), to: new Date(end).toISOString() };
}

beforeAll(async () => {
  product = await startProduct();
  await seedPlantIntoProduct(product, { referencePhotos: 6, historyDays: 10, perStationPerDay: 6 });
  // A limit every day with a failure passes, so the check below raises alerts whatever the run rules find.
  const supervisor = await product.db.dataSource.getRepository(UserEntity).findOneByOrFail({ username: 'supervisor' });
  const [rule] = await product.db.dataSource.query(`select id from rules where name like 'Bracket%'`);
  await product.services.alerts.createLimit(supervisor, { ruleId: rule.id, stationId: null, maxDefectFraction: 0.01 });
  await product.services.alerts.check();
  const range = defaultRange();
  chart = await product.services.trends.pChart({ ...range, bucket: 'day', runRules: 'western-electric' });
  pareto = await product.services.trends.pareto(range);
  photoDir = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-study-photos-'));
  for await (const photo of generateDataset({ count: 1, seed: 43, families: ['washer'], sizes: [DEMO_FRAME], defectShare: 0, retakeShare: 0 })) {
    for (const n of [1, 2, 3]) {
      const file = path.join(photoDir, `washer-take-${n}.png`);
      fs.writeFileSync(file, photo.buffer);
      samePartPhotos.push(file);
    }
  }
});
afterAll(async () => {
  await product?.close();
  if (photoDir) fs.rmSync(photoDir, { recursive: true, force: true });
});

const signIn = (page: Page) => signInAs(page, product.url, 'supervisor');

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('the supervisor at %s width', (name, viewport) => {
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

  test('sees the p-chart with its control limits and the signals in words', async () => {
    expect(chart.points.length).toBeGreaterThan(0);
    await page.goto(`${product.url}/trends`);
    const plot = page.getByRole('img', { name: /^p-chart of \d+ subgroups/ });
    await plot.waitFor();
    expect(await plot.getAttribute('aria-label')).toContain(`p-chart of ${chart.points.length} subgroups, ${chart.points.filter((p) => p.signal).length} marked`);
    // The limits are the two dashed step lines (drawn after the plot's frame: wait for them, then count).
    await plot.locator('path[stroke-dasharray]').nth(1).waitFor({ state: 'attached' });
    expect(await plot.locator('path[stroke-dasharray]').count()).toBe(2);
    await page.getByText('control limits (UCL, LCL)').waitFor();
    const count = chart.signals.length;
    await page.getByText(count === 0 ? /No run rule fired in this range/ : `${count} signal${count === 1 ? '' : 's'}, newest first`).waitFor();
    if (count > 0) {
      const newest = [...chart.signals].sort((a, b) => b.pointIndex - a.pointIndex)[0];
      await page.getByRole('link', { name: new RegExp(`\\(${newest.rule}\\)|^Western Electric rule ${newest.rule.slice(2)} at`) }).first().waitFor();
    }
    await plot.scrollIntoViewIfNeeded();
    await screenshot(page, `trends-chart-${name}`);
    if (name === 'wide') {
      // Three subgroups a day put the points closer together than a date is wide: the x axis's dates
      // must still be whole, not cut to "N…".
      await page.getByRole('radio', { name: 'Shift', exact: true }).click();
      const shiftPlot = page.getByRole('img', { name: /^p-chart of \d+ subgroups/ });
      const daily = `p-chart of ${chart.points.length} subgroups,`;
      for (let tries = 0; tries < 300 && (await shiftPlot.getAttribute('aria-label'))?.startsWith(daily); tries++) await page.waitForTimeout(100);
      await shiftPlot.locator('path[stroke-dasharray]').nth(1).waitFor({ state: 'attached' });
      const labels = shiftPlot.getByText(/^[A-Z][a-z]{2} \d{1,2}\s*\d\d:\d\d$/);
      expect(await labels.count()).toBeGreaterThan(1);
      expect(await textsCutShort(labels)).toEqual([]);
      await shiftPlot.scrollIntoViewIfNeeded();
      await screenshot(page, 'trends-chart-per-shift-wide');
      await page.getByRole('radio', { name: 'Day', exact: true }).click();
      await page.getByRole('img', { name: `p-chart of ${chart.points.length} subgroups`, exact: false }).waitFor();
    }
  });

  test('the table view lists the same number of points', async () => {
    await page.getByRole('button', { name: 'Show as table' }).click();
    const table = page.getByRole('table', { name: /^p-chart values/ });
    await table.waitFor();
    // One header row, then one row per subgroup.
    expect(await table.getByRole('row').count()).toBe(chart.points.length + 1);
    const last = chart.points[chart.points.length - 1];
    await table.getByRole('row').last().getByText(`${(last.p * 100).toFixed(2)} %`).first().waitFor();
    await table.scrollIntoViewIfNeeded();
    await screenshot(page, `trends-table-${name}`);
    await page.getByRole('button', { name: 'Show as chart' }).click();
  });

  test('a tap on the largest cause opens exactly its failed inspections', async () => {
    const top = pareto.bars[0];
    expect(top).toBeDefined();
    await page.goto(`${product.url}/trends?section=${name === 'phone' ? 'causes' : 'chart'}`);
    const plot = page.getByRole('img', { name: /^Causes of failure/ });
    await plot.waitFor();
    await plot.scrollIntoViewIfNeeded();
    await screenshot(page, `trends-causes-${name}`);
    // The chart package draws each bar as a focusable element inside the chart; the first bar is the largest cause.
    await plot.locator('div[tabindex="0"]').nth(1).click();
    await page.waitForURL(/\/records\?/);
    const url = new URL(page.url());
    expect(url.searchParams.get('cause')).toBe(top.cause);
    expect(url.searchParams.get('verdict')).toBe('FAIL');
    await page.getByText(`cause “${top.cause}”`).waitFor();
    const shown = Math.min(top.count, 50);
    await page.getByText(`${shown} shown, newest first`).waitFor();
    expect(await page.getByRole('link', { name: /^FAIL, / }).count()).toBe(shown);
    await screenshot(page, `trends-cause-records-${name}`);
  });

  test('a second limit for the same rule and stations is refused in sight, saying what comes first', async () => {
    await page.goto(`${product.url}/trends?section=alerts`);
    await page.getByRole('button', { name: 'Add a limit' }).click();
    const dialog = page.getByRole('dialog', { name: 'Add an alert limit' });
    await dialog.getByRole('radio', { name: /^Bracket/ }).click();
    await dialog.getByLabel('Alert above this share failed per day (%)').fill('5');
    await dialog.getByRole('button', { name: 'Add limit' }).click();
    const banner = dialog.getByRole('alert').filter({ hasText: 'already has a limit for every station' });
    await banner.getByText('The message says what has to happen first. Reload to see the current state, then try again.').waitFor();
    // The banner sits below the fields, under the dialog's fold at both widths: it must be scrolled into sight.
    // Within the window, and not clipped by the dialog's scrolling body (or any other scrolled box around it).
    for (let tries = 0; tries < 50 && !(await inSight(banner)); tries++) await page.waitForTimeout(100);
    expect(await inSight(banner)).toBe(true);
    await screenshot(page, `trends-limit-refused-${name}`);
    await dialog.getByRole('button', { name: 'Cancel' }).click();
    await dialog.waitFor({ state: 'detached' });
    // The browser logs the refusal itself; nothing else went wrong.
    expect(errors.splice(0)).toEqual(['Failed to load resource: the server responded with a status of 409 (Conflict)']);
  });

  test('acknowledges an alert with a note', async () => {
    await page.goto(`${product.url}/trends?section=alerts`);
    const acknowledge = page.getByRole('button', { name: /^Acknowledge the alert at / }).first();
    await acknowledge.waitFor();
    const [{ open }] = await product.db.dataSource.query(`select count(*)::int as open from alerts where acknowledged_at is null`);
    expect(open).toBeGreaterThan(0);
    await acknowledge.click();
    const dialog = page.getByRole('dialog', { name: 'Acknowledge the alert' });
    await dialog.getByRole('button', { name: 'Acknowledge', exact: true }).click();
    await dialog.getByText(/Write what was checked or done/).waitFor();
    const note = `Checked the deburr brush at ${name} width; worn, replaced.`;
    await dialog.getByLabel('What was checked or done').fill(note);
    await dialog.getByRole('button', { name: 'Acknowledge', exact: true }).click();
    await dialog.waitFor({ state: 'detached' });
    const [row] = await product.db.dataSource.query(`select acknowledgement_note as note from alerts where acknowledgement_note = $1`, [note]);
    expect(row?.note).toBe(note);
    await page.getByRole('radio', { name: 'Acknowledged' }).click();
    await page.getByText(note).waitFor();
    await screenshot(page, `trends-alert-acknowledged-${name}`);
    expect(errors).toEqual([]);
  });

  test('runs a repeatability study of one part and reads each gauge\'s spread', async () => {
    await page.goto(`${product.url}/trends?section=agreement`);
    await page.getByRole('button', { name: 'New study' }).click();
    await page.getByRole('radio', { name: 'Washer rim and bore check v1', exact: true }).click();
    await page.getByRole('radio', { name: 'Lathe 7 exit' }).click();
    const part = `Washer S/N 4471-${name}`;
    await page.getByLabel('Part (serial number or tag)').fill(part);
    await page.getByRole('radio', { name: 'Good', exact: true }).click();
    const chooser = page.waitForEvent('filechooser');
    await page.getByRole('button', { name: 'Choose photos' }).click();
    await (await chooser).setFiles(samePartPhotos);
    await page.getByText('3 photos chosen: washer-take-1.png, washer-take-2.png, washer-take-3.png').waitFor();
    await page.getByRole('button', { name: 'Run the study' }).click();
    await page.getByRole('heading', { name: `Study of “${part}”` }).waitFor({ timeout: 120_000 });
    // One image three times: the same verdict each time, and no spread at all (s = 0, range = 0).
    await page.getByText(/^✓ Consistent: every judged photo got the same verdict \((PASS|FAIL)\)\.$/).waitFor();
    const spread = page.getByRole('table', { name: 'Spread of each gauge over the photos' });
    const area = spread.getByRole('row').filter({ hasText: 'Washer area' });
    const cells = await area.getByRole('cell').allInnerTexts();
    expect(cells.slice(0, 5)).toEqual(['Washer area', '3', expect.stringMatching(/^\d+\.\d mm²$/), '0.000', '0.000']);
    await spread.scrollIntoViewIfNeeded();
    if (name === 'wide') {
      // On a wide screen the whole table shows, down to its last column (the share of the tolerance), with no sideways scrolling.
      expect(await inSight(spread.getByRole('columnheader', { name: '% tolerance' }))).toBe(true);
    }
    await screenshot(page, `trends-repeatability-${name}`);
    expect(errors).toEqual([]);
  });
});
