// The engineer's workbench in a real browser against the real server: build a rule from scratch,
// see the live preview's verdict on a reference photo (and the server agreeing), run a trial, read
// its figures and submit the draft for review at wide width, the preview staying beside the step
// being edited; the rules list, a rule page, its pipeline as a list of steps and a trial's figures on
// a phone.
import type { BrowserContext, Page } from 'playwright-core';
import { chooseRadio, inSight, launchBrowser, PHONE, screenshot, seedPlantIntoProduct, startProduct, watchErrors, WIDE, type RunningProduct, signInAs } from '../support/browser';

jest.setTimeout(600_000);

const RULE_NAME = 'Bracket flange scratch check';

let product: RunningProduct;
beforeAll(async () => {
  product = await startProduct();
  await seedPlantIntoProduct(product, { referencePhotos: 6, historyDays: 0, perStationPerDay: 0 });
});
afterAll(() => product?.close());

const signIn = (page: Page, username: string) => signInAs(page, product.url, username);

/**
 * The demo bracket rule's page for the engineer, in a browser of its own (a test before may have left
 * someone signed in); the caller closes `own`.
 */
async function demoRuleInOwnBrowser(viewport: { width: number; height: number }): Promise<{ own: BrowserContext; page: Page; errors: string[] }> {
  const own = await launchBrowser(viewport);
  try {
    const page = await own.newPage();
    const errors = watchErrors(page);
    await signIn(page, 'engineer');
    await page.goto(`${product.url}/rules`);
    await page.getByRole('link', { name: 'Open rule Bracket hole and edge check' }).click();
    return { own, page, errors };
  } catch (e) {
    await own.close();
    throw e;
  }
}

describe('at wide width', () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await launchBrowser(WIDE);
  });
  afterAll(() => browser?.close());

  test('an engineer builds a rule, previews it, runs a trial and submits it for review', async () => {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page, 'engineer');
    await page.goto(`${product.url}/rules`);

    // A new rule starts from the simple pipeline.
    await page.getByRole('button', { name: 'New rule' }).first().click();
    const dialog = page.getByRole('dialog');
    await dialog.getByLabel('Rule name').fill(RULE_NAME);
    await dialog.getByRole('radio', { name: 'Stamped bracket 60×30' }).click();
    await dialog.getByLabel('Smallest defect to catch (mm, optional)').fill('0.5');
    // One dialog for screen readers, named by its title (WAI-ARIA dialog pattern: aria-modal, aria-labelledby).
    // The web modal's own element takes the dialog role once shown; it holds the backdrop ("Close dialog").
    const backdrop = page.getByRole('button', { name: 'Close dialog' });
    await page.getByRole('dialog').filter({ has: backdrop }).waitFor();
    expect(await page.getByRole('dialog').count()).toBe(1);
    expect(await page.getByRole('dialog', { name: 'New rule' }).filter({ has: backdrop }).count()).toBe(1);
    await dialog.getByRole('button', { name: 'Create rule' }).click();
    await page.getByRole('heading', { name: RULE_NAME }).waitFor();
    await page.getByText('Version 1 (draft) · saved').waitFor();

    // Add a median step and set its size; add a gauge with a limit.
    await page.getByRole('radio', { name: 'Median' }).click();
    await page.getByRole('button', { name: 'Add Median' }).click();
    await page.getByRole('textbox', { name: 'Step 5: Median, Size (px)', exact: true }).fill('5');
    await page.getByText('Step 5: Median', { exact: true }).waitFor();
    await page.getByRole('button', { name: 'Add a gauge' }).click();
    // The new gauge opens for editing; the saved one shows its summary.
    await page.getByLabel(/^Gauge \d+ name$/).last().fill('Largest mark');
    await page.getByLabel(/^Gauge \d+, highest allowed \(px²\)$/).fill('400000');
    await page.getByText(/has unsaved changes/).waitFor();
    await page.getByRole('button', { name: 'Save draft' }).click();
    await page.getByText('Version 1 (draft) · saved').waitFor();

    // The live preview on a reference photo, then the server's check of the same numbers.
    await page.getByRole('radio', { name: /reference photos/ }).first().click();
    await page.getByRole('radio', { name: /^Photo / }).first().click();
    const verdict = page.getByRole('heading', { name: /^Preview verdict: (PASS|FAIL|RETAKE)$/ });
    await verdict.waitFor({ timeout: 60_000 });
    await page.getByRole('button', { name: 'Show 5. Median large' }).waitFor();
    await page.getByText('Largest mark', { exact: true }).first().waitFor();
    await page.getByRole('button', { name: 'Check on server' }).click();
    await page.getByText('✓ The server agrees with the preview').waitFor({ timeout: 60_000 });
    await screenshot(page, 'workbench-preview-wide');

    // A trial of the saved draft on the reference set, followed until its figures show.
    await page.getByRole('button', { name: 'Run trial' }).click();
    await page.getByText(/good parts failed\): /).waitFor({ timeout: 120_000 });
    await page.getByRole('table', { name: 'Confusion table: labels against verdicts' }).waitFor();
    expect(await page.getByText(/defective parts passed\)/).first().textContent()).toMatch(/defective parts passed\): (\d+\.\d % \(\d+ of \d+; 95 % interval|no photos)/);
    await page.getByText(/^Cohen’s kappa/).waitFor();
    await page.getByRole('radio', { name: 'Largest mark' }).click();
    await page.getByText(/Press a dot to use its limit/).waitFor();
    await screenshot(page, 'workbench-trial-wide');

    // Submitting with a note: the version goes to review and can no longer be edited.
    await page.getByRole('button', { name: 'Submit for review' }).first().click();
    const submit = page.getByRole('dialog');
    await submit.getByLabel('Note for the reviewer').fill('Median added against speckle; trial attached.');
    await submit.getByRole('button', { name: 'Submit for review' }).click();
    await page.getByText('◷ v1 In review').waitFor({ timeout: 30_000 });
    // No editor, and no new draft on offer: the server keeps one open draft or review per rule.
    await page.getByText(/^Version 1 is in review\. A rule has one open draft or review at a time/).waitFor();
    expect(await page.getByRole('button', { name: 'Save draft' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /^New draft from version/ }).count()).toBe(0);
    await screenshot(page, 'workbench-submitted-wide');
    expect(errors).toEqual([]);
    await page.close();
  });
  test('the live preview stays in sight beside the gauge being edited, and so does the draft’s Save', async () => {
    const { own, page, errors } = await demoRuleInOwnBrowser(WIDE);
    try {
      await page.getByRole('radio', { name: /reference photos/ }).first().click();
      await page.getByRole('radio', { name: /^Photo / }).first().click();
      await page.getByRole('radio', { name: /Press 3 exit/ }).first().click();
      const verdict = page.getByRole('heading', { name: /^Preview verdict: (PASS|FAIL|RETAKE)$/ });
      await verdict.waitFor({ timeout: 60_000 });
      // The photos' tiles name each defect kind as the plant's catalogue does, not by its code.
      expect(await page.getByRole('radio', { name: /^Photo .*, defective \([A-Z][a-z ]+\)$/ }).count()).toBeGreaterThan(0);
      expect(await page.getByRole('radio', { name: /, defective \([a-z]+(-[a-z]+)+\)$/ }).count()).toBe(0);
      // Far down the editor: the last gauge's region choice, below every step and the other gauges.
      await page.getByRole('button', { name: /^Edit Gauge \d+, / }).last().click();
      const region = page.getByRole('radiogroup', { name: 'Region' }).last();
      await region.scrollIntoViewIfNeeded();
      expect(await inSight(region)).toBe(true);
      expect(await inSight(verdict)).toBe(true);
      expect(await inSight(page.getByRole('button', { name: 'Save draft' }))).toBe(true);
      await screenshot(page, 'workbench-preview-beside-gauges-wide');
      expect(errors).toEqual([]);
    } finally {
      await own.close();
    }
  });
});

describe('at phone width', () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await launchBrowser(PHONE);
  });
  afterAll(() => browser?.close());

  test('the rules list and a rule page fit a phone', async () => {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page, 'engineer');
    await page.goto(`${product.url}/rules`);
    const link = page.getByRole('link', { name: 'Open rule Bracket hole and edge check' });
    await link.waitFor();
    // The search stays; the other filters fold into one line that says what is chosen.
    await page.getByLabel('Search rules').waitFor();
    await page.getByText('Everyone’s rules · latest version in any state · every part type').waitFor();
    expect(await page.getByRole('radiogroup', { name: 'Owner' }).count()).toBe(0);
    await screenshot(page, 'workbench-rules-phone');
    const box = await link.boundingBox();
    expect(box!.width).toBeLessThanOrEqual(PHONE.width);
    expect(box!.height).toBeGreaterThanOrEqual(44);
    await link.click();
    await page.getByRole('heading', { name: 'Versions' }).waitFor();
    await page.getByText(/v1 Released/).first().waitFor();
    await screenshot(page, 'workbench-rule-phone');
    expect(errors).toEqual([]);
    await page.close();
  });

  test('a saved pipeline reads as a list of steps on a phone: each opens for editing, and Save stays in sight', async () => {
    const { own, page, errors } = await demoRuleInOwnBrowser(PHONE);
    try {
      // The demo draft's second step is a library kernel: its summary shows, its settings wait.
      await page.getByText('library kernel “gaussian-5”').first().waitFor();
      const edit = page.getByRole('button', { name: 'Edit Step 2: Kernel' });
      expect(await edit.getAttribute('aria-expanded')).toBe('false');
      expect(await page.getByRole('radiogroup', { name: 'Step 2: Kernel, Kernel', exact: true }).count()).toBe(0);
      await edit.click();
      const done = page.getByRole('button', { name: 'Done editing Step 2: Kernel' });
      expect(await done.getAttribute('aria-expanded')).toBe('true');
      expect(await page.getByRole('radiogroup', { name: 'Step 2: Kernel, Kernel', exact: true }).count()).toBe(1);
      expect(await page.getByRole('radio', { name: 'gaussian-5', exact: true }).getAttribute('aria-checked')).toBe('true');
      // A saved gauge says what it measures, where and within what limits until it is opened.
      await page.getByText(/^Largest blob area on Step 4: Threshold · \d+(\.\d+)? to \d+(\.\d+)? mm² · whole photo$/).waitFor();
      await page.getByText(/^Highest value on the last step \(Step 5: Laplacian of Gaussian\) · at most /).waitFor();
      await page.getByRole('button', { name: 'Edit Gauge 1, Plate area' }).click();
      // Two kernel steps: a gauge's choice of step names each by its kernel as well.
      await page.getByRole('radio', { name: 'Step 3: Kernel, library kernel “sharpen”' }).first().waitFor();
      // Choosing another kernel marks the draft changed; Save is still in sight down the page.
      await page.getByRole('radio', { name: 'gaussian-7', exact: true }).click();
      const adder = page.getByText('Add a step', { exact: true });
      await adder.scrollIntoViewIfNeeded();
      await page.getByText(/has unsaved changes/).waitFor();
      expect(await inSight(page.getByRole('button', { name: 'Save draft' }))).toBe(true);
      await screenshot(page, 'workbench-pipeline-list-phone');
      await done.click();
      expect(await page.getByRole('radiogroup', { name: 'Step 2: Kernel, Kernel', exact: true }).count()).toBe(0);
      expect(errors).toEqual([]);
    } finally {
      await own.close();
    }
  });

  test('leaving a draft with unsaved changes asks first, and a refused save says so where Save is', async () => {
    const { own, page, errors } = await demoRuleInOwnBrowser(PHONE);
    try {
      await page.getByText(/\(draft\) · saved/).waitFor();
      const ruleUrl = page.url();
      const leave = page.getByRole('dialog', { name: 'Leave without saving?' });
      await page.getByRole('radio', { name: 'Median' }).click();
      await page.getByRole('button', { name: 'Add Median' }).click();
      const unsaved = page.getByText(/has unsaved changes/);
      await unsaved.waitFor();

      // A tab asks; staying keeps the page and the change.
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Home' }).click();
      await leave.getByText(/^Version \d+ \(draft\) has changes that are not saved\. If you leave now, they are lost\.$/).waitFor();
      await leave.getByRole('button', { name: 'Keep editing' }).click();
      await leave.waitFor({ state: 'hidden' });
      expect(page.url()).toBe(ruleUrl);
      expect(await unsaved.isVisible()).toBe(true);

      // The browser's back button is held too: the address and the page stay until the answer.
      await page.evaluate('window.history.back()');
      await leave.waitFor();
      expect(page.url()).toBe(ruleUrl);
      await leave.getByRole('button', { name: 'Keep editing' }).click();
      await leave.waitFor({ state: 'hidden' });
      expect(await unsaved.isVisible()).toBe(true);

      // Leaving on purpose drops the change: the draft opens again as it was saved.
      await page.getByRole('button', { name: 'All rules' }).click();
      await leave.getByRole('button', { name: 'Leave without saving' }).click();
      await page.getByRole('link', { name: 'Open rule Bracket hole and edge check' }).click();
      await page.getByText(/\(draft\) · saved/).waitFor();
      expect(await page.getByText('Step 6: Median', { exact: true }).count()).toBe(0);

      // A value the server refuses, saved from far down the page: the refusal shows in the bar that stays on screen.
      await page.getByRole('button', { name: /^Edit Step 5/ }).click();
      const sigma = page.getByLabel(/sigma/i).last();
      await sigma.fill('-1');
      await page.getByText('Add a step', { exact: true }).scrollIntoViewIfNeeded();
      await page.getByRole('button', { name: 'Save draft' }).click();
      const refusal = page.getByText('⚠ Not saved: the server found 1 problem, marked ⚠ beside the fields below.');
      await refusal.waitFor();
      expect(await inSight(refusal)).toBe(true);
      // The field's message names it by its label, not by the rule document's code (sigma).
      await page.getByText(/^⚠ Sigma must be between 0\.3 and 10/).first().waitFor();
      await screenshot(page, 'workbench-refused-save-phone');
      // Correcting the field clears it.
      await sigma.fill('2');
      await refusal.waitFor({ state: 'hidden' });
      // Text that is not a number: the bar says so and Save waits (the document still holds the field's last number).
      await sigma.fill('abc');
      const unreadable = page.getByText(/: 1 field holds text that is not a number; correct it to save$/);
      await unreadable.waitFor();
      expect(await inSight(unreadable)).toBe(true);
      expect(await page.getByRole('button', { name: 'Save draft' }).getAttribute('aria-disabled')).toBe('true');
      await sigma.fill('2');
      await unreadable.waitFor({ state: 'hidden' });
      // The refused save is the browser's one logged failure.
      expect(errors).toEqual(['Failed to load resource: the server responded with a status of 400 (Bad Request)']);
    } finally {
      await own.close();
    }
  });

  test('a trial of the demo draft runs on a phone and its confusion table fits the screen', async () => {
    const { own, page, errors } = await demoRuleInOwnBrowser(PHONE);
    await page.getByText('Live preview').waitFor();
    await page.getByRole('radio', { name: /reference photos/ }).first().click();
    await page.getByRole('radio', { name: /^Photo / }).first().click();
    // Its gauges are in mm: the trial needs a calibrated station, chosen beside it; the preview uses the same one.
    const run = page.getByRole('button', { name: 'Run trial' });
    expect(await run.getAttribute('aria-disabled')).toBe('true');
    await chooseRadio(page.getByRole('radiogroup', { name: 'Station whose calibration turns px into mm' }).getByRole('radio', { name: /Press 3 exit/ }));
    await page.getByText(/^Gauges in mm use 0\.156 mm\/px, the calibration of Line 1 — stamping · Press 3 exit/).waitFor();
    const previewStation = page.getByRole('radiogroup', { name: 'Station (its calibration turns px into mm)' }).getByRole('radio', { name: /Press 3 exit/ });
    expect(await previewStation.getAttribute('aria-checked')).toBe('true');
    await page.getByRole('heading', { name: /^Preview verdict: (PASS|FAIL|RETAKE)$/ }).waitFor({ timeout: 60_000 });
    await run.click();
    // The trial is a queued job; on a loaded machine it may wait for a worker before it runs.
    await page.getByText(/Waiting to start|Running|good parts failed\): /).first().waitFor({ timeout: 60_000 });
    const table = page.getByRole('table', { name: 'Confusion table: labels against verdicts' });
    await table.waitFor({ timeout: 300_000 }).catch(async (e: unknown) => {
      await screenshot(page, 'workbench-trial-phone-waiting');
      throw e;
    });
    await table.scrollIntoViewIfNeeded();
    await screenshot(page, 'workbench-trial-phone');
    const box = await table.boundingBox();
    expect(box!.x).toBeGreaterThanOrEqual(0);
    expect(box!.x + box!.width).toBeLessThanOrEqual(PHONE.width);
    // Limit tuning: the list of limits waits behind a button; each row reads differently, and a row sets the draft's limit.
    const listButton = page.getByRole('button', { name: /^List the limits \(\d+ rows?\)$/ });
    await listButton.click();
    const limitRows = page.getByLabel('Limits and their rates').getByRole('button');
    const rowTexts = await limitRows.allInnerTexts();
    expect(rowTexts.length).toBeGreaterThan(0);
    expect(new Set(rowTexts).size).toBe(rowTexts.length);
    for (const row of await limitRows.all()) {
      const rowBox = (await row.boundingBox())!;
      expect(rowBox.x + rowBox.width).toBeLessThanOrEqual(PHONE.width);
    }
    await limitRows.first().click();
    await page.getByText(/\(draft\) has unsaved changes/).waitFor();
    expect(errors).toEqual([]);
    await own.close();
  });
});
