import fs from 'node:fs';
import type { Server } from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Locator, type Page } from 'playwright-core';
import { DEMO_PASSWORD, seedDemoUsers } from '../../server/seed/demo-users';
import { createTestApp } from './app';
import type { TestDatabase } from './db';
import type { Services } from '../../server/services';
import type { DemoPlantOptions } from '../../server/seed/demo-plant';
import { runInNode } from './in-node';

export const PHONE = { width: 390, height: 844 };
export const WIDE = { width: 1280, height: 800 };
export const SCREENSHOT_DIR = path.join(__dirname, '..', 'artifacts', 'screenshots');

const WEB_DIR = path.join(__dirname, '..', '..', 'dist');

export interface RunningProduct {
  url: string;
  /** Where the product keeps its images. */
  imageDir: string;
  db: TestDatabase;
  /** The server's services, to set up what a test needs (e.g. seedDemoPlant). */
  services: Services;
  close(): Promise<void>;
}

/** The real server with the exported web app, on a fresh database seeded like the demo. */
export async function startProduct(): Promise<RunningProduct> {
  if (!fs.existsSync(path.join(WEB_DIR, 'index.html'))) throw new Error('dist/ is missing: run the tests with `npm test` (it builds the web app)');
  const product = await createTestApp({ webDir: WEB_DIR });
  await seedDemoUsers(product.db.dataSource);
  const server: Server = await new Promise((resolve) => {
    const s = product.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  const address = server.address();
  if (!address || typeof address === 'string') throw new Error('no address');
  return {
    url: `http://127.0.0.1:${address.port}`,
    db: product.db,
    imageDir: product.config.imageDir,
    services: product.services,
    async close() {
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await product.close();
    },
  };
}

/** Debian's Chromium, headless, with a throw-away profile (STACK.md, "Playwright launch that worked"). */
/** Signs in through the sign-in screen and waits for the app's main navigation. */
export async function signInAs(page: Page, url: string, username: string, password: string = DEMO_PASSWORD): Promise<void> {
  await page.goto(`${url}/sign-in`);
  await page.getByLabel('User name').fill(username);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByRole('navigation', { name: 'Main' }).waitFor();
}

export async function launchBrowser(viewport: { width: number; height: number }): Promise<BrowserContext> {
  return chromium.launchPersistentContext(fs.mkdtempSync(path.join(os.tmpdir(), 'kw-chromium-')), {
    executablePath: process.env.KW_CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    viewport,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
}

export async function screenshot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(SCREENSHOT_DIR, { recursive: true });
  await page.screenshot({ path: path.join(SCREENSHOT_DIR, `${name}.png`), fullPage: true });
}

/**
 * Clicks a radio until it is checked, three tries of five seconds. On a page still laying itself out
 * (a preview arriving above it) the radio can move between Playwright's aim and its click, which then
 * lands beside it; a person would tap again.
 */
export async function chooseRadio(radio: Locator, tries = 3): Promise<void> {
  for (let attempt = 0; attempt < tries; attempt++) {
    await radio.click();
    const deadline = Date.now() + 5_000;
    while (Date.now() < deadline) {
      if ((await radio.getAttribute('aria-checked')) === 'true') return;
      await radio.page().waitForTimeout(100);
    }
  }
  throw new Error(`the radio ${radio.toString()} stayed unchecked after ${tries} clicks`);
}

/**
 * True when the element is wholly inside the window and no box around it that scrolls (a dialog's
 * body, a table's sideways scroller) hides any part of it.
 */
export async function inSight(locator: Locator): Promise<boolean> {
  const view = locator.page().viewportSize()!;
  return locator.evaluate((el, windowSize) => {
    const own = el.getBoundingClientRect();
    if (own.top < 0 || own.left < 0 || own.bottom > windowSize.height || own.right > windowSize.width) return false;
    for (let box = el.parentElement; box; box = box.parentElement) {
      const edge = box.getBoundingClientRect();
      const hiddenDown = box.scrollHeight > box.clientHeight + 1 && (own.top < edge.top - 1 || own.bottom > edge.bottom + 1);
      const hiddenAcross = box.scrollWidth > box.clientWidth + 1 && (own.left < edge.left - 1 || own.right > edge.right + 1);
      if (hiddenDown || hiddenAcross) return false;
    }
    return true;
  }, view);
}

/** The texts, among the elements `locator` finds, that are cut short in their own box (an ellipsis, a clipped line). */
export async function textsCutShort(locator: Locator): Promise<string[]> {
  return locator.evaluateAll((texts) => texts.filter((t) => t.scrollWidth > t.clientWidth + 1 || t.scrollHeight > t.clientHeight + 1).map((t) => t.textContent ?? ''));
}

/** Collects page errors so a test can assert the page ran cleanly. */
export function watchErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (err) => errors.push(err.message));
  page.on('console', (msg) => {
    if (msg.type() === 'error' && !/Failed to load resource: the server responded with a status of 40[13]/.test(msg.text())) errors.push(msg.text());
  });
  return errors;
}

/**
 * Seeds the demo plant into a running product's database from a plain Node process (several times
 * faster than inside Jest's sandbox; see in-node.ts).
 */
export async function seedPlantIntoProduct(product: RunningProduct, options: DemoPlantOptions): Promise<void> {
  await runInNode('tests/support/seed-in-node.ts', 'seedPlantInto', [product.db.url, product.imageDir, options]);
}
