// A supervisor's review desk at phone and wide widths: the queue of submitted versions, a version's
// page (what changed against the released version side by side, the trial, the author's note),
// sending one back with a note, releasing another (a wrong password signs nothing; the right one
// signs with a meaning, and the signature shows printed name, date and time and meaning), and
// withdrawing a released version with a reason, after which operators can no longer choose it.
import type { BrowserContext, Page } from 'playwright-core';
import { UserEntity } from '../../server/components/auth/entities';
import type { FamilyName } from '../../server/demo';
import { partTypeCode } from '../../server/seed/demo-plant';
import { DEMO_PASSWORD } from '../../server/seed/demo-users';
import { DEMO_RULES } from '../../server/seed/rules';
import type { RuleDocument } from '../../shared/rules/schema';
import { launchBrowser, PHONE, screenshot, seedPlantIntoProduct, startProduct, watchErrors, WIDE, type RunningProduct, signInAs } from '../support/browser';

/** The open dialog's panel (react-native-web's Modal wraps it in a second, unnamed dialog element). */
function openDialog(page: Page) {
  return page.locator('[role="dialog"][aria-labelledby]');
}

jest.setTimeout(600_000);

let product: RunningProduct;

beforeAll(async () => {
  product = await startProduct();
  // Part types, calibrated stations and reference sets; the rules this file reviews are its own (below).
  await seedPlantIntoProduct(product, { referencePhotos: 6, historyDays: 0 });
});
afterAll(() => product?.close());

const STATION_OF: Record<FamilyName, string> = { washer: 'Lathe 7 exit', bracket: 'Press 3 exit', gasket: 'Moulding press 2' };

async function person(username: string): Promise<UserEntity> {
  return product.db.dataSource.getRepository(UserEntity).findOneByOrFail({ username });
}

/** A finished trial of the version on its family's reference set, at its station's calibration. */
async function tryVersion(versionId: string, family: FamilyName): Promise<void> {
  const [set] = await product.db.dataSource.query(`select id from reference_sets where part_type = $1`, [partTypeCode(family)]);
  const [station] = await product.db.dataSource.query(`select id from stations where name = $1`, [STATION_OF[family]]);
  await product.services.trials.start(await person('engineer'), { ruleVersionId: versionId, referenceSetId: set.id, stationId: station.id });
}

/** A rule whose version 1 the engineer submitted and the supervisor released, through the same services as the app. */
async function releasedRule(name: string, family: FamilyName): Promise<{ ruleId: string; name: string; versionId: string }> {
  const engineer = await person('engineer');
  const rule = await product.services.rules.create(engineer, { name, partType: partTypeCode(family), smallestDefectMm: 0.3, document: { ...DEMO_RULES[family].released, name } });
  const versionId = rule.versions[0].id;
  await tryVersion(versionId, family);
  await product.services.rules.submit(engineer, versionId, 'First release');
  await product.services.rules.release(await person('supervisor'), versionId, { password: DEMO_PASSWORD, meaning: 'approval', note: '' });
  return { ruleId: rule.id, name, versionId };
}

/** Version 2 of the rule, tried and submitted by the engineer with a note. */
async function submittedVersion(rule: { ruleId: string; name: string }, family: FamilyName, document: RuleDocument, note: string): Promise<string> {
  const engineer = await person('engineer');
  const draft = await product.services.rules.newDraft(engineer, rule.ruleId);
  await product.services.rules.saveDraft(engineer, draft.id, { ...document, name: rule.name }, note);
  await tryVersion(draft.id, family);
  await product.services.rules.submit(engineer, draft.id, note);
  return draft.id;
}

async function versionState(versionId: string): Promise<{ state: string; review_note: string | null; withdraw_reason: string | null }> {
  const [row] = await product.db.dataSource.query(`select state, review_note, withdraw_reason from rule_versions where id = $1`, [versionId]);
  return row;
}

const signIn = (page: Page, username: string, password = DEMO_PASSWORD) => signInAs(page, product.url, username, password);

/** Another person signed in on a device of their own at this width; their page must raise no errors. */
async function onOwnDevice(viewport: { width: number; height: number }, username: string, use: (page: Page) => Promise<void>): Promise<void> {
  const browser = await launchBrowser(viewport);
  try {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page, username);
    await use(page);
    expect(errors).toEqual([]);
  } finally {
    await browser.close();
  }
}

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('the supervisor at %s width', (widthName, viewport) => {
  // Each width reviews rules of its own, so that the two runs do not depend on each other.
  const washer = `Washer rim and bore check (${widthName})`;
  const bracket = `Bracket hole and edge check (${widthName})`;
  const gasket = `Gasket ring defects (${widthName})`;
  const washerNote = 'Tighter notch and lump limits after the March complaint';
  let washerV2: string;
  let bracketV2: string;
  let gasketV1: string;
  let gasketRuleId: string;
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];

  beforeAll(async () => {
    const w = await releasedRule(washer, 'washer');
    washerV2 = await submittedVersion(w, 'washer', DEMO_RULES.washer.inReview, washerNote);
    const b = await releasedRule(bracket, 'bracket');
    bracketV2 = await submittedVersion(b, 'bracket', DEMO_RULES.bracket.inProgress, 'A median before the smoothing, against JPEG artefacts');
    const g = await releasedRule(gasket, 'gasket');
    gasketV1 = g.versionId;
    gasketRuleId = g.ruleId;
    browser = await launchBrowser(viewport);
    page = await browser.newPage();
    errors = watchErrors(page);
    await signIn(page, 'supervisor');
  });
  afterAll(() => browser?.close());

  test('the review queue lists the submitted versions with their authors and notes', async () => {
    await page.goto(`${product.url}/review`);
    const queue = page.getByRole('list', { name: 'Versions in review' });
    await queue.getByRole('link', { name: `Review ${washer} version 2, submitted by Ines Varga` }).waitFor();
    await queue.getByRole('link', { name: `Review ${bracket} version 2, submitted by Ines Varga` }).waitFor();
    expect(await queue.getByText(`“${washerNote}”`).count()).toBe(1);
    await screenshot(page, `review-queue-${widthName}`);
  });

  test('the engineer sees the version in review on the rule page, with no new draft on offer (a rule has one open draft or review)', async () => {
    await onOwnDevice(viewport, 'engineer', async (engineer) => {
      const [row] = await product.db.dataSource.query(`select id from rules where name = $1`, [washer]);
      await engineer.goto(`${product.url}/rules/${row.id}`);
      await engineer.getByText(/^Version 2 is in review\. A rule has one open draft or review at a time/).waitFor();
      expect(await engineer.getByRole('button', { name: /^New draft from version/ }).count()).toBe(0);
      // The author still reads the trial the version went to review with.
      await engineer.getByText('The trial submitted with version 2').waitFor();
      await engineer.getByRole('table', { name: 'Confusion table: labels against verdicts' }).waitFor();
      await screenshot(engineer, `rule-in-review-engineer-${widthName}`);
    });
  });

  test('a submitted version shows what changed against the released version side by side, its trial and the author’s note', async () => {
    await page.getByRole('link', { name: `Review ${washer} version 2, submitted by Ines Varga` }).click();
    await page.getByRole('heading', { name: 'What changed' }).waitFor();
    // The in-review washer rule tightens two limits (server/seed/rules: 0.0715 → 0.07 and −0.078 → −0.077).
    await page.getByText('2 differences from the released version.').waitFor();
    const notch = page.getByRole('row', { name: /^Notch response · limits/ });
    const released = notch.getByRole('cell', { name: /at most 0\.0715/ });
    const proposed = notch.getByRole('cell', { name: /at most 0\.07$/ });
    const [before, after] = [await released.boundingBox(), await proposed.boundingBox()];
    // Side by side: the two versions' values share a line, the released one on the left.
    expect(Math.abs(before!.y - after!.y)).toBeLessThan(2);
    expect(before!.x + before!.width).toBeLessThanOrEqual(after!.x);
    expect(await page.getByRole('columnheader', { name: 'v1 (released)' }).count()).toBeGreaterThan(0);
    // Only the differences at first; every row on request.
    expect(await page.getByRole('row', { name: /^Step 1/ }).count()).toBe(0);
    await screenshot(page, `review-version-differences-${widthName}`);
    await page.getByRole('radio', { name: 'Every setting, step and gauge' }).click();
    await page.getByRole('row', { name: /^Step 1 .*gaussian-5.*gaussian-5/ }).waitFor();
    await page.getByRole('heading', { name: 'Trial on the reference set' }).waitFor();
    await page.getByText('False reject rate').waitFor();
    await page.getByRole('table', { name: /Confusion table/ }).waitFor();
    await page.getByText(`“${washerNote}”`).waitFor();
    await screenshot(page, `review-version-${widthName}`);
  });

  test('a wrong password signs nothing; the right one releases with the chosen meaning and shows the signature', async () => {
    await page.getByRole('button', { name: `Release ${washer} v2` }).click();
    const dialog = openDialog(page);
    await dialog.getByRole('radio', { name: 'Responsible for release' }).click();
    await dialog.getByLabel('Your password').fill('not-my-password');
    await dialog.getByRole('button', { name: 'Continue' }).click();
    await dialog.getByRole('button', { name: 'Sign and release' }).click();
    await dialog.getByText('Not your password: nothing was signed. Enter your own password.').waitFor();
    await screenshot(page, `review-release-refused-${widthName}`);
    expect((await versionState(washerV2)).state).toBe('in-review');

    await dialog.getByLabel('Your password').fill(DEMO_PASSWORD);
    await dialog.getByRole('button', { name: 'Continue' }).click();
    await dialog.getByRole('button', { name: 'Sign and release' }).click();
    await dialog.waitFor({ state: 'hidden' });
    await page.getByText('✓ Released').waitFor();
    expect((await versionState(washerV2)).state).toBe('released');

    // 21 CFR 11.50: the printed name of the signer, the date and time of signing, and its meaning.
    const [signature] = await product.db.dataSource.query(`select signer_name, meaning, signed_at from signatures where rule_version_id = $1`, [washerV2]);
    expect(signature).toMatchObject({ signer_name: 'Mara Lindqvist', meaning: 'responsibility' });
    const shown = page.getByRole('list', { name: 'Signatures' }).getByRole('listitem');
    expect(await shown.count()).toBe(1);
    const text = (await shown.textContent()) ?? '';
    expect(text).toContain('Mara Lindqvist');
    expect(text).toContain('Responsible for release');
    const signedAt: string = await page.evaluate((iso) => new Date(iso).toLocaleString(undefined, { dateStyle: 'medium', timeStyle: 'long' }), new Date(signature.signed_at).toISOString());
    expect(text).toContain(signedAt);
    expect(text).toContain('✓ Valid: matches the signed content');
    await screenshot(page, `review-released-${widthName}`);
  });

  test('a trial that passed defective parts is a caution the signer must tick before releasing', async () => {
    // A gasket rule whose attached trial passed 2 of 5 defective parts (escape rate = defective judged
    // PASS ÷ labelled defective, common practice), recorded as the trial runner records its summary.
    const engineer = await person('engineer');
    const name = `Gasket with escapes (${widthName})`;
    const rule = await product.services.rules.create(engineer, { name, partType: partTypeCode('gasket'), smallestDefectMm: 0.3, document: { ...DEMO_RULES.gasket.released, name } });
    const id = rule.versions[0].id;
    const rate = (count: number, of: number) => ({ count, of, rate: count / of, low: null, high: null });
    const summary = { table: { good: { PASS: 5, FAIL: 0, RETAKE: 0 }, defective: { PASS: 2, FAIL: 3, RETAKE: 0 }, retake: { PASS: 0, FAIL: 0, RETAKE: 0 } }, images: 10, unlabelled: 0, agreement: rate(8, 10), falseRejectRate: rate(0, 5), escapeRate: rate(2, 5), retakeRate: rate(0, 10), kappa: 0.6, medianMs: 20 };
    const [set] = await product.db.dataSource.query(`select id from reference_sets where part_type = $1`, [partTypeCode('gasket')]);
    await product.db.dataSource.query(
      `insert into trials (rule_version_id, reference_set_id, content_hash, state, total, processed, started_by, finished_at, summary) values ($1, $2, $3, 'done', 10, 10, $4, now(), $5)`,
      [id, set.id, rule.versions[0].contentHash, engineer.id, JSON.stringify(summary)],
    );
    await product.services.rules.submit(engineer, id, 'Two escapes: the small nicks, to be caught by v2');
    await page.goto(`${product.url}/review/${id}`);
    await page.getByRole('button', { name: `Release ${name} v1` }).click();
    const dialog = openDialog(page);
    const caution = '⚠ In its trial the rule passed 2 of 5 defective parts (escape rate 40.0 %): released as it is, it would ship parts like them.';
    await dialog.getByText(caution).waitFor();
    await dialog.getByLabel('Your password').fill(DEMO_PASSWORD);
    await dialog.getByRole('button', { name: 'Continue' }).click();
    await dialog.getByText('Tick this to release the rule with these results, or close and send it back.').waitFor();
    expect(await dialog.getByRole('button', { name: 'Sign and release' }).count()).toBe(0);
    await screenshot(page, `review-release-caution-${widthName}`);
    await dialog.getByRole('checkbox', { name: /I have read these trial results/ }).click();
    await dialog.getByRole('button', { name: 'Continue' }).click();
    await dialog.getByText(/You release it knowing: In its trial the rule passed 2 of 5 defective parts/).waitFor();
    await dialog.getByRole('button', { name: 'Sign and release' }).click();
    await dialog.waitFor({ state: 'hidden' });
    expect((await versionState(id)).state).toBe('released');
    const [event] = await product.db.dataSource.query(`select details from audit_events where action = 'rule-version.release' and entity_id = $1`, [id]);
    expect(event.details.trialCautions).toEqual([caution.slice(2)]);
  });

  test('sending a version back needs a note, and the engineer gets it with the version as a draft', async () => {
    await page.goto(`${product.url}/review/${bracketV2}`);
    await page.getByRole('button', { name: `Send ${bracket} v2 back to the engineer` }).click();
    const dialog = openDialog(page);
    await dialog.getByRole('button', { name: 'Send back' }).click();
    await dialog.getByText('Say what must change').waitFor();
    await dialog.getByLabel('What must change').fill('Try the median on the reference set with the JPEG photos first; the trial has none.');
    await screenshot(page, `review-send-back-${widthName}`);
    await dialog.getByRole('button', { name: 'Send back' }).click();
    await dialog.waitFor({ state: 'hidden' });
    await page.getByText('↩ Draft, sent back').waitFor();
    await page.getByText(/Reviewer’s note: “Try the median/).waitFor();
    expect(await versionState(bracketV2)).toMatchObject({ state: 'draft', review_note: 'Try the median on the reference set with the JPEG photos first; the trial has none.' });
  });

  test('withdrawing a released version needs a reason and takes it off the line', async () => {
    await page.goto(`${product.url}/review`);
    await page.getByRole('link', { name: `Open ${gasket} version 1, released` }).click();
    // A first version has nothing to compare with: it is shown whole, in one column.
    await page.getByRole('heading', { name: 'What the version holds' }).waitFor();
    expect(await page.getByRole('columnheader', { name: 'v1 (this version)' }).count()).toBe(3);
    await page.getByRole('button', { name: `Withdraw ${gasket} v1 from the line` }).click();
    const dialog = openDialog(page);
    await dialog.getByRole('heading', { name: `Withdraw ${gasket} v1` }).waitFor();
    await dialog.getByLabel('Reason for withdrawal').fill('Flash on the new mould is missed; back to the engineer.');
    await screenshot(page, `review-withdraw-${widthName}`);
    await dialog.getByRole('button', { name: 'Withdraw' }).click();
    await dialog.waitFor({ state: 'hidden' });
    await page.getByText('⊘ Withdrawn').waitFor();
    const reason = page.getByText('Withdrawn: “Flash on the new mould is missed; back to the engineer.”');
    await reason.waitFor();
    await reason.scrollIntoViewIfNeeded();
    expect(await versionState(gasketV1)).toMatchObject({ state: 'withdrawn', withdraw_reason: 'Flash on the new mould is missed; back to the engineer.' });
    expect(await page.getByRole('button', { name: /^Withdraw / }).count()).toBe(0);
    await screenshot(page, `review-withdrawn-${widthName}`);
    // The one refused signature answered 400 on purpose; nothing else failed.
    expect(errors).toEqual(['Failed to load resource: the server responded with a status of 400 (Bad Request)']);
  });

  test('an operator whose device remembered the withdrawn version is told so and chooses among the released rules', async () => {
    await onOwnDevice(viewport, 'operator', async (operator) => {
      // This device last inspected with the gasket rule at its station, before the withdrawal.
      const [station] = await product.db.dataSource.query(`select id from stations where name = $1`, [STATION_OF.gasket]);
      await operator.evaluate(`localStorage.setItem('kernwright.inspect.choice', ${JSON.stringify(JSON.stringify({ stationId: station.id, ruleId: gasketRuleId }))})`);
      await operator.goto(`${product.url}/inspect`);
      await operator.getByRole('alert').getByText('⚠ The rule this device remembered is no longer released').waitFor();
      // The station inspects gasket rings: it offers the gasket rules still released (the demo's), not the withdrawn one.
      const rules = operator.getByRole('radiogroup', { name: /^Released rules for / });
      await rules.getByRole('radio', { name: 'Gasket ring defects · v1' }).waitFor();
      expect(await rules.getByRole('radio', { name: new RegExp(`^${gasket.replace(/[()]/g, '\\$&')}`) }).count()).toBe(0);
      // The station is still remembered; no rule is ticked, so nothing can start with the withdrawn one.
      expect(await operator.getByRole('radio', { name: STATION_OF.gasket }).textContent()).toBe(`✓ ${STATION_OF.gasket}`);
      expect(await operator.getByRole('button', { name: 'Use this station and rule' }).isDisabled()).toBe(true);
      await screenshot(operator, `review-operator-choice-${widthName}`);
      // The washer's station offers the washer rule's newly released version.
      await operator.getByRole('radio', { name: STATION_OF.washer }).click();
      await operator.getByRole('radiogroup', { name: /^Released rules for / }).getByRole('radio', { name: `${washer} · v2` }).waitFor();
    });
  });
});
