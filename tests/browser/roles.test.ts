// Sign in as each demo role at phone and wide widths, check the navigation each one sees,
// and keep screenshots of every home screen under tests/artifacts/screenshots/ for people to look at.
import type { BrowserContext, Page } from 'playwright-core';
import { DEMO_PASSWORD } from '../../server/seed/demo-users';
import { launchBrowser, PHONE, screenshot, startProduct, textsCutShort, watchErrors, WIDE, type RunningProduct } from '../support/browser';

jest.setTimeout(120_000);

// What each role may use (issue 2: navigation shows only what the user's roles may use).
const EXPECTED_AREAS: Record<string, string[]> = {
  engineer: ['Home', 'Rules', 'Reference sets'],
  operator: ['Home', 'Inspect'],
  supervisor: ['Home', 'Review', 'Rules', 'Stations', 'Trends', 'Records'],
  auditor: ['Home', 'Rules', 'Trends', 'Records'],
  admin: ['Home', 'Stations', 'Users'],
};

let product: RunningProduct;
beforeAll(async () => {
  product = await startProduct();
});
afterAll(() => product?.close());

async function signIn(page: Page, username: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${product.url}/sign-in`);
  await page.getByLabel('User name').fill(username);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
}

/** Names of every area the navigation offers, including those behind the phone's Menu tab. */
async function navigationAreas(page: Page): Promise<string[]> {
  const nav = page.getByRole('navigation', { name: 'Main' });
  await nav.getByRole('link', { name: 'Home' }).waitFor();
  const names = await nav.getByRole('link').evaluateAll((links) => links.map((l) => l.getAttribute('aria-label') ?? l.textContent ?? ''));
  const menu = nav.getByRole('button', { name: /^Menu/ });
  if (await menu.count()) {
    await menu.click();
    const dialog = page.getByRole('dialog', { name: 'Menu' });
    await dialog.waitFor();
    names.push(...(await dialog.getByRole('link').evaluateAll((links) => links.map((l) => l.getAttribute('aria-label') ?? ''))));
    // Escape closes the dialog once its opening animation has finished (react-native-web's Modal).
    await expect(closeWithEscape(page, dialog)).resolves.toBe(true);
  }
  return names;
}

async function closeWithEscape(page: Page, dialog: ReturnType<Page['getByRole']>): Promise<boolean> {
  for (let attempt = 0; attempt < 10; attempt++) {
    await page.keyboard.press('Escape');
    try {
      await dialog.waitFor({ state: 'hidden', timeout: 500 });
      return true;
    } catch {
      // still opening
    }
  }
  return false;
}

describe.each([
  ['phone', PHONE],
  ['wide', WIDE],
] as const)('at %s width', (widthName, viewport) => {
  let browser: BrowserContext;
  beforeAll(async () => {
    browser = await launchBrowser(viewport);
  });
  afterAll(() => browser?.close());

  test.each(Object.keys(EXPECTED_AREAS))('%s signs in and sees only their areas', async (role) => {
    const page = await browser.newPage();
    const errors = watchErrors(page);
    await signIn(page, role);
    const areas = await navigationAreas(page);
    expect(areas).toEqual(EXPECTED_AREAS[role]);
    if (widthName === 'wide') {
      // A side rail on a wide screen, tabs along the bottom on a phone.
      const box = await page.getByRole('navigation', { name: 'Main' }).boundingBox();
      expect(box!.height).toBeGreaterThan(viewport.height / 2);
    } else {
      const box = await page.getByRole('navigation', { name: 'Main' }).boundingBox();
      expect(box!.y + box!.height).toBeGreaterThan(viewport.height - 5);
      expect(box!.height).toBeGreaterThanOrEqual(44);
    }
    await page.waitForLoadState('networkidle');
    await screenshot(page, `home-${role}-${widthName}`);
    expect(errors).toEqual([]);
    await page.evaluate('localStorage.clear()');
    await page.close();
  });

  test('a wrong password shows a clear message and keeps the person on the sign-in screen', async () => {
    const page = await browser.newPage();
    await signIn(page, 'engineer', 'not-the-password');
    const alert = page.getByRole('alert');
    await alert.waitFor();
    expect(await alert.textContent()).toMatch(/user name and password do not match/i);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await screenshot(page, `sign-in-wrong-password-${widthName}`);
    await page.close();
  });
});

test('an area outside the user’s roles says so instead of showing it', async () => {
  const browser = await launchBrowser(PHONE);
  try {
    const page = await browser.newPage();
    await signIn(page, 'operator');
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    await page.goto(`${product.url}/admin/users`);
    await page.getByText(/not available for your roles/i).waitFor();
    await screenshot(page, 'users-refused-operator-phone');
  } finally {
    await browser.close();
  }
});

test('the administrator’s users table lists the demo people', async () => {
  const browser = await launchBrowser(WIDE);
  try {
    const page = await browser.newPage();
    await signIn(page, 'admin');
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Users' }).click();
    for (const name of ['Ines Varga', 'Tomas Reyes', 'Mara Lindqvist', 'Kofi Mensah', 'Priya Nair']) await page.getByText(name).first().waitFor();
    // On a wide screen the demo people's e-mail addresses show whole, not cut short with an ellipsis.
    const addresses = page.getByRole('table', { name: 'Users' }).getByRole('cell').getByText(/@fernwick\.example$/);
    expect(await addresses.count()).toBe(5);
    expect(await textsCutShort(addresses)).toEqual([]);
    await screenshot(page, 'users-admin-wide');
  } finally {
    await browser.close();
  }
});
