// An auditor reads a rule's history (issue 8) at phone and wide widths: from the records area to the rule's
// versions, each with what changed from the one before, its signature (printed name, date and time,
// meaning; 21 CFR 11.50) and its state changes; and from an inspection record straight to the version it used.
import { UserEntity } from '../../server/components/auth/entities';
import { DEMO_PASSWORD } from '../../server/seed/demo-users';
import { launchBrowser, PHONE, screenshot, startProduct, watchErrors, WIDE, type RunningProduct } from '../support/browser';
import { spotPhoto, SPOT_RULE } from '../support/photos';

jest.setTimeout(180_000);

const RULE_NAME = 'Plate bright spots';
let product: RunningProduct;
let ruleId: string;
let inspectionId: string;

/** A finished trial on the version's current content (the trial runner has tests of its own). */
async function recordTrial(versionId: string, contentHash: string, engineerId: string, setName: string): Promise<void> {
  const q = (sql: string, p: unknown[]) => product.db.dataSource.query(sql, p);
  const [set] = await q(`insert into reference_sets (name, part_type, created_by) values ($1, 'plate', $2) returning id`, [setName, engineerId]);
  await q(`insert into trials (rule_version_id, reference_set_id, content_hash, state, started_by, finished_at) values ($1, $2, $3, 'done', $4, now())`, [versionId, set.id, contentHash, engineerId]);
}

beforeAll(async () => {
  product = await startProduct();
  const { rules, stations, inspections } = product.services;
  const users = product.db.dataSource.getRepository(UserEntity);
  const [engineer, supervisor, operator] = await Promise.all(['engineer', 'supervisor', 'operator'].map((username) => users.findOneByOrFail({ username })));
  await product.db.dataSource.query(`insert into part_types (code, name, family) values ('plate', 'Plate', 'plate')`);
  const line = await stations.createLine(supervisor, { name: 'Line 1' });
  const station = await stations.createStation(supervisor, { lineId: line.id, name: 'Press 1', cameraNote: '' });

  const rule = await rules.create(engineer, { name: RULE_NAME, partType: 'plate', smallestDefectMm: null, document: SPOT_RULE });
  ruleId = rule.id;
  const v1 = rule.versions[0];
  await recordTrial(v1.id, v1.contentHash, engineer.id, 'Plates, first batch');
  await rules.submit(engineer, v1.id, 'First release');
  await rules.release(supervisor, v1.id, { password: DEMO_PASSWORD, meaning: 'approval', note: 'Limits follow drawing rev A' });
  inspectionId = (await inspections.inspect(operator, { stationId: station.id, ruleVersionId: v1.id, idempotencyKey: 'history-browser-1' }, await spotPhoto(1, 2))).inspection.id;

  // Version 2: a median step in front and a tighter limit; released, which supersedes version 1.
  const draft = await rules.newDraft(engineer, ruleId);
  const second = { ...SPOT_RULE, steps: [{ op: 'median', size: 3 }, ...SPOT_RULE.steps], gauges: [{ ...SPOT_RULE.gauges[0], limits: { max: 12 } }] };
  const saved = await rules.saveDraft(engineer, draft.id, second, 'Median removes single bright pixels');
  await recordTrial(saved.id, saved.contentHash, engineer.id, 'Plates, second batch');
  await rules.submit(engineer, saved.id, 'Tighter spot limit');
  await rules.release(supervisor, saved.id, { password: DEMO_PASSWORD, meaning: 'responsibility', note: '' });
});
afterAll(() => product?.close());

test.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('an auditor opens a rule’s history and sees its versions, signatures and what changed (%s)', async (name, viewport) => {
  const browser = await launchBrowser(viewport);
  try {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await page.goto(`${product.url}/sign-in`);
    await page.getByLabel('User name').fill('auditor');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('navigation', { name: 'Main' }).waitFor();

    // The records area's way in: Rule history, then the rule.
    await page.goto(`${product.url}/records`);
    await page.getByRole('button', { name: /^Rule history/ }).click();
    await page.getByRole('link', { name: `History of the rule ${RULE_NAME}` }).click();
    await page.getByRole('heading', { name: `History of ${RULE_NAME}` }).waitFor();

    // Version 2, open: released, what changed from version 1, its signature and its state changes.
    await page.getByRole('heading', { name: 'Version 2' }).waitFor();
    const changes = page.getByRole('list', { name: 'Changes from version 1 to version 2' });
    await changes.getByText('Steps · Step 1').waitFor();
    await changes.getByText('Version 2: Median: 3×3 px').waitFor();
    await changes.getByText('Version 1: at most 20').waitFor();
    await changes.getByText('Version 2: at most 12').waitFor();
    expect(await changes.getByText('+ added').count()).toBe(1);
    const signatures = page.getByRole('list', { name: 'Signatures' });
    await signatures.getByText('Mara Lindqvist').first().waitFor();
    await signatures.getByText(/Responsible for release/).waitFor();
    await signatures.getByText(/Valid: matches the signed content/).waitFor();
    await page.getByRole('list', { name: 'Events of version 2' }).getByText('Released with a signature — Mara Lindqvist').waitFor();
    if (name === 'phone') {
      const toggle = await page.getByRole('button', { name: 'Show the details of version 1' }).boundingBox();
      expect(toggle!.height).toBeGreaterThanOrEqual(44);
    }
    await screenshot(page, `rule-history-auditor-${name}`);

    // Version 1 opens on request: superseded, its own signature with the meaning "approval".
    await page.getByRole('button', { name: 'Show the details of version 1' }).click();
    const v1Events = page.getByRole('list', { name: 'Events of version 1' });
    await v1Events.getByText('Superseded by a newer release — Mara Lindqvist').waitFor();
    await v1Events.getByText(/Approved for production · “Limits follow drawing rev A”/).waitFor();
    await page.getByText('The first version: there is nothing before it to compare with.').waitFor();

    // From an inspection record straight to the version it was judged with.
    await page.goto(`${product.url}/records/${inspectionId}`);
    await page.getByRole('link', { name: /^History of Plate bright spots, opened at version 1/ }).click();
    await page.getByText('→ The version the inspection you came from was judged with.').waitFor();
    await page.getByRole('list', { name: 'Events of version 1' }).waitFor();
    await screenshot(page, `rule-history-from-record-${name}`);
    expect(errors).toEqual([]);
  } finally {
    await browser.close();
  }
});
