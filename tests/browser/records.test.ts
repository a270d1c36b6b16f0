// The auditor's records: filter the table, open an inspection, check the audit trail (issue 8), at both widths; a malformed record link.
import type { Page } from 'playwright-core';
import { UserEntity } from '../../server/components/auth/entities';
import { DEMO_PASSWORD } from '../../server/seed/demo-users';
import { launchBrowser, PHONE, screenshot, signInAs, startProduct, watchErrors, WIDE, type RunningProduct } from '../support/browser';
import { spotPhoto, SPOT_RULE } from '../support/photos';

jest.setTimeout(180_000);

let product: RunningProduct;
beforeAll(async () => {
  product = await startProduct();
  const { rules, stations, inspections } = product.services;
  const users = product.db.dataSource.getRepository(UserEntity);
  const [engineer, supervisor, operator] = await Promise.all(['engineer', 'supervisor', 'operator'].map((username) => users.findOneByOrFail({ username })));
  await product.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  const line = await stations.createLine(supervisor, { name: 'Line 1' });
  const station = await stations.createStation(supervisor, { lineId: line.id, name: 'Press 1', cameraNote: '' });
  const rule = await rules.create(engineer, { name: 'Plate spots', partType: 'plate', smallestDefectMm: null, document: SPOT_RULE });
  const v = rule.versions[0];
  const [set] = await product.db.dataSource.query(`insert into reference_sets (name, part_type, created_by) values ('s', 'plate', $1) returning id`, [engineer.id]);
  await product.db.dataSource.query(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by) values ($1, $2, $3, 'done', $4)`, [v.id, set.id, v.contentHash, engineer.id]);
  await rules.submit(engineer, v.id, '');
  await rules.release(supervisor, v.id, { password: DEMO_PASSWORD, meaning: 'approval', note: '' });
  for (const [i, side] of [0, 8, 2].entries()) await inspections.inspect(operator, { stationId: station.id, ruleVersionId: v.id, idempotencyKey: `browser-rec-${i}` }, await spotPhoto(i, side));
});
afterAll(() => product?.close());

/** The auditor signed in on a browser of the given size, closed afterwards. */
async function asAuditor(viewport: typeof PHONE | typeof WIDE, use: (page: Page, errors: string[]) => Promise<void>): Promise<void> {
  const browser = await launchBrowser(viewport);
  try {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signInAs(page, product.url, 'auditor');
    await use(page, errors);
  } finally {
    await browser.close();
  }
}

test.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('an auditor finds the failed inspection, opens it and checks the audit trail (%s)', (name, viewport) =>
  asAuditor(viewport, async (page, errors) => {
    await page.goto(`${product.url}/records`);
    await page.getByText('3 shown, newest first').waitFor();
    // On a phone the filters fold into one line, so that the list starts on the first screen.
    if (name === 'phone') {
      await page.getByText('Every verdict · all stations · disputed or not').waitFor();
      expect(await page.getByRole('radio', { name: 'FAIL', exact: true }).count()).toBe(0);
      await page.getByRole('button', { name: 'Change filters' }).click();
    }
    await page.getByRole('radio', { name: 'FAIL', exact: true }).click();
    await page.getByText('1 shown, newest first').waitFor();
    if (name === 'phone') {
      await page.getByRole('button', { name: 'Done' }).click();
      await page.getByText(/^FAIL only · all stations/).waitFor();
    }
    await page.getByRole('button', { name: 'Check the audit trail' }).click();
    await page.getByText(/Intact: all \d+ events/).waitFor();
    await screenshot(page, `records-auditor-${name}`);
    await page.getByRole('link', { name: /^FAIL, Plate spots at Press 1/ }).click();
    await page.getByText('Inspection record').waitFor();
    await page.getByText('Spot area', { exact: true }).first().waitFor();
    // The record reads what was found; the operator's instructions stay on the station's screen.
    await page.getByText('The part was outside a limit.', { exact: true }).waitFor();
    expect(await page.getByText(/Mark the part|Set it aside/).count()).toBe(0);
    await screenshot(page, `record-detail-auditor-${name}`);
    expect(errors).toEqual([]);
  }),
);

test.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('a cut or mistyped record link says the address is wrong, with no pointless "Try again" (%s)', (name, viewport) =>
  asAuditor(viewport, async (page, errors) => {
    await page.goto(`${product.url}/records/not-a-record`);
    const banner = page.getByRole('alert').filter({ hasText: 'This page’s address is not valid.' });
    await banner.getByText('Go back to the list and open it from there.').waitFor();
    expect(await banner.getByRole('button', { name: 'Try again' }).count()).toBe(0);
    await screenshot(page, `record-bad-address-${name}`);
    expect(errors).toEqual(['Failed to load resource: the server responded with a status of 400 (Bad Request)']);
  }),
);

test('a date the list cannot read is said beside the field, and nothing is listed or exported meanwhile', () =>
  asAuditor(PHONE, async (page, errors) => {
    await page.goto(`${product.url}/records`);
    await page.getByText('3 shown, newest first').waitFor();
    await page.getByRole('button', { name: 'Change filters' }).click();
    const from = page.getByLabel('From (YYYY-MM-DD, UTC)');
    const to = page.getByLabel('To (inclusive)');
    const exportCsv = page.getByRole('button', { name: 'Export CSV' });
    await from.fill('05/11/2026');
    await page.getByText('⚠ Write the day as YYYY-MM-DD: 05/11/2026 could be day/month or month/day.').waitFor();
    await page.getByText('Check the filters', { exact: true }).waitFor();
    expect(await page.getByText(/shown, newest first/).count()).toBe(0);
    expect(await exportCsv.isDisabled()).toBe(true);
    await screenshot(page, 'records-unreadable-date-phone');
    // A readable but empty range says why it is empty.
    await from.fill('2026-12-03');
    await to.fill('2026-12-01');
    await page.getByText('⚠ From (2026-12-03) is after To (2026-12-01): no day lies between them.').waitFor();
    expect(await exportCsv.isDisabled()).toBe(true);
    // Cleared, the list and the export are back.
    await from.fill('');
    await to.fill('');
    await page.getByText('3 shown, newest first').waitFor();
    expect(await exportCsv.isDisabled()).toBe(false);
    // The reference on a failed part's tag finds its record alone.
    const failed = page.getByRole('link', { name: /^FAIL, Plate spots at Press 1/ });
    const reference = /record ([0-9A-F]{4}-[0-9A-F]{4})/.exec(await failed.innerText())![1];
    const referenceField = page.getByLabel('Record reference (from the part’s tag)');
    await referenceField.fill(reference.toLowerCase());
    await page.getByText('1 shown, newest first').waitFor();
    expect(await failed.count()).toBe(1);
    await referenceField.fill('7F3A-19');
    await page.getByText('⚠ A record reference is eight letters A–F and digits, e.g. 7F3A-19C2.').waitFor();
    expect(await exportCsv.isDisabled()).toBe(true);
    await referenceField.fill('');
    await page.getByText('3 shown, newest first').waitFor();
    expect(errors).toEqual([]);
  }));
