// The operator's loop on a phone (choose station and rule, photograph, verdict, dispute, next part,
// a photo kept on the device while offline and sent once when back) and a supervisor releasing a
// rule version on a wide screen (a wrong password signs nothing; the right one releases and shows the signature).
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { BrowserContext, Page } from 'playwright-core';
import { generateDataset } from '../../server/demo';
import { DEMO_FRAME } from '../../server/seed/demo-plant';
import { seedPlantIntoProduct, signInAs } from '../support/browser';
import { DEMO_PASSWORD } from '../../server/seed/demo-users';
import { launchBrowser, PHONE, screenshot, startProduct, watchErrors, WIDE, type RunningProduct } from '../support/browser';

jest.setTimeout(600_000);

let product: RunningProduct;
let photoDir: string;
const photos: string[] = [];

beforeAll(async () => {
  product = await startProduct();
  await seedPlantIntoProduct(product, { referencePhotos: 6, historyDays: 1, perStationPerDay: 1 });
  photoDir = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-operator-photos-'));
  for await (const photo of generateDataset({ count: 3, seed: 41, families: ['washer'], sizes: [DEMO_FRAME], defectShare: 0.5, retakeShare: 0 })) {
    const file = path.join(photoDir, photo.fileName);
    fs.writeFileSync(file, photo.buffer);
    photos.push(file);
  }
});
afterAll(async () => {
  await product?.close();
  if (photoDir) fs.rmSync(photoDir, { recursive: true, force: true });
});

const signIn = (page: Page, username: string) => signInAs(page, product.url, username);

async function inspectionCount(): Promise<number> {
  const [row] = await product.db.dataSource.query(`select count(*)::int as n from inspections where created_at > now() - interval '1 hour'`);
  return row.n;
}

async function photograph(page: Page, file: string): Promise<void> {
  const chooser = page.waitForEvent('filechooser');
  await page.getByRole('button', { name: 'Photograph part' }).click();
  await (await chooser).setFiles(file);
}

describe('the operator at phone width', () => {
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];
  beforeAll(async () => {
    browser = await launchBrowser(PHONE);
    page = await browser.newPage();
    errors = watchErrors(page);
    await signIn(page, 'operator');
  });
  afterAll(() => browser?.close());

  test('chooses a station and a released rule, and the device remembers them', async () => {
    await page.goto(`${product.url}/inspect`);
    await page.getByRole('radio', { name: 'Lathe 7 exit' }).click();
    await page.getByRole('radio', { name: /^Washer rim and bore check/ }).click();
    await screenshot(page, 'inspect-choose-phone');
    await page.getByRole('button', { name: 'Use this station and rule' }).click();
    const button = page.getByRole('button', { name: 'Photograph part' });
    await button.waitFor();
    // One-handed use: the main button sits in the lower half of the phone's screen.
    const box = await button.boundingBox();
    expect(box!.y + box!.height / 2).toBeGreaterThan(PHONE.height / 2);
    await page.reload();
    await page.getByRole('button', { name: 'Photograph part' }).waitFor();
    expect(await page.getByText('Lathe 7 exit · Line 2').count()).toBe(1);
  });

  test('photographs a part and sees the verdict with its measurements against limits', async () => {
    const before = await inspectionCount();
    await photograph(page, photos[0]);
    const verdict = page.getByTestId('verdict');
    await verdict.waitFor({ timeout: 60_000 });
    expect(await verdict.getByRole('heading', { level: 2 }).first().textContent()).toMatch(/^(PASS|FAIL|RETAKE)$/);
    // The longest verdict word stays on one line beside the mark at phone width (56 px broke RETAKE in two).
    const oneLine = await verdict.getByRole('heading', { level: 2 }).first().evaluate((el) => {
      const shown = el.textContent;
      el.textContent = 'I';
      const oneLineHeight = el.getBoundingClientRect().height;
      el.textContent = 'RETAKE';
      const height = el.getBoundingClientRect().height;
      el.textContent = shown;
      return height < 1.5 * oneLineHeight;
    });
    expect(oneLine).toBe(true);
    await page.getByRole('heading', { name: /Measurements against limits|What was wrong with the photo/ }).waitFor();
    expect(await page.getByText(/A verdict is a decision aid/).count()).toBe(1);
    // The washer rule's area gauge: its unit as the symbol mm², not the rule document's code mm2.
    const measured = await page.getByRole('list', { name: 'Measurements against limits' }).innerText();
    expect(measured).toMatch(/Washer area[\s\S]*\d mm²/);
    expect(measured).not.toMatch(/mm2/);
    await screenshot(page, 'inspect-verdict-phone');
    expect(await inspectionCount()).toBe(before + 1);
    // The record's reference, to write on the part's tag, is the stored inspection's id's first eight hex digits.
    const [{ id }] = await product.db.dataSource.query(`select id from inspections order by created_at desc limit 1`);
    const reference = `${id.slice(0, 4)}-${id.slice(4, 8)}`.toUpperCase();
    expect(await verdict.innerText()).toContain(`Record ${reference} · `);
  });

  test('disputes the verdict with a note', async () => {
    await page.getByRole('button', { name: 'Dispute verdict' }).click();
    await page.getByLabel('Why does the verdict look wrong?').fill('The mark is oil from the fixture; it wipes off.');
    await page.getByRole('button', { name: 'Send dispute' }).click();
    await page.getByText('⚑ Disputed').waitFor();
    const [row] = await product.db.dataSource.query(`select note from disputes order by raised_at desc limit 1`);
    expect(row.note).toBe('The mark is oil from the fixture; it wipes off.');
    await screenshot(page, 'inspect-disputed-phone');
  });

  test('goes on to the next part in one tap', async () => {
    await page.getByRole('button', { name: 'Next part' }).click();
    await page.getByRole('button', { name: 'Photograph part' }).waitFor();
  });

  test('keeps a photo on the device while offline and sends it once when the network is back', async () => {
    const before = await inspectionCount();
    await browser.setOffline(true);
    await photograph(page, photos[1]);
    await page.getByText('Photo kept on this device').waitFor();
    await page.getByText('1 photo waits on this device').waitFor();
    await screenshot(page, 'inspect-queued-phone');
    expect(await inspectionCount()).toBe(before);
    await browser.setOffline(false);
    await page.getByText('Verdicts of waiting photos').waitFor({ timeout: 60_000 });
    expect(await page.getByTestId('queue-banner').count()).toBe(0);
    expect(await inspectionCount()).toBe(before + 1);
    expect(errors.filter((e) => !/ERR_INTERNET_DISCONNECTED/.test(e))).toEqual([]);
  });
});

describe('the supervisor at wide width', () => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await launchBrowser(WIDE);
  });
  afterAll(() => browser?.close());

  test('a wrong password signs nothing; the right one releases the version and shows the signature', async () => {
    const page = await browser.newPage();
    await signIn(page, 'supervisor');
    await page.goto(`${product.url}/review`);
    await page.getByRole('link', { name: /^Review Washer rim and bore check version 2/ }).click();
    await page.getByRole('heading', { name: 'What changed' }).waitFor();
    await page.getByText(/differences? from the released version/).waitFor();
    await page.getByText('False reject rate').waitFor();
    await screenshot(page, 'review-version-wide');

    await page.getByRole('button', { name: /^Release Washer rim/ }).click();
    await page.getByRole('radio', { name: 'Approved for production' }).click();
    await page.getByLabel('Your password').fill('not-my-password');
    await page.getByRole('button', { name: 'Continue' }).click();
    await page.getByRole('button', { name: 'Sign and release' }).click();
    await page.getByText(/Not your password/).waitFor();
    await screenshot(page, 'review-release-refused-wide');
    const [refused] = await product.db.dataSource.query(`select state from rule_versions v join rules r on r.id = v.rule_id where r.name like 'Washer%' and v.number = 2`);
    expect(refused.state).toBe('in-review');

    await page.getByLabel('Your password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Continue' }).click();
    await page.getByRole('button', { name: 'Sign and release' }).click();
    await page.getByText('✓ Released').waitFor();
    await page.getByText(/Approved for production · /).waitFor();
    await page.getByText('✓ Valid: matches the signed content').waitFor();
    await page.getByRole('list', { name: 'Signatures' }).getByText('Mara Lindqvist', { exact: true }).waitFor();
    await screenshot(page, 'review-released-wide');
    const [released] = await product.db.dataSource.query(`select state from rule_versions v join rules r on r.id = v.rule_id where r.name like 'Washer%' and v.number = 2`);
    expect(released.state).toBe('released');
  });
});
