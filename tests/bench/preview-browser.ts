// Preview update time in headless Chromium: the draft editor's live preview of the standard pipeline
// (Gaussian σ → Sobel magnitude → Otsu → open r=1, edge-fraction gauge) on a 1.3 MP and a 5 MP
// reference photo, after a change of the Gaussian's sigma, as the page itself measures it: from the
// change to the first frame that shows the new result ("change to updated preview", which includes
// the editor's 150 ms pause for typing when the run waited for it), and the engine's own time for the
// run; changes in quick succession and single changes. Once with the browser
// as it is (the WebAssembly SIMD engine), once with WebAssembly removed from the page before the app
// loads, where the preview falls back to plain TypeScript.
// The real server serves the built web app on a throw-away database; figures only, nothing passes or fails.
//
// Run: KW_TEST_DATABASE_URL=postgres://postgres@127.0.0.1:<port> npx ts-node --transpile-only -P server/tsconfig.json tests/bench/preview-browser.ts
// Settings: KW_WEB_DIR (a web build to serve; default: exported here into a temporary folder),
// KW_BENCH_CHANGES (parameter changes per photo, 9), KW_CHROMIUM (/usr/bin/chromium).
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import type { Server } from 'node:http';
import os from 'node:os';
import path from 'node:path';
import { chromium, type Page } from 'playwright-core';
import sharp from 'sharp';
import { UserEntity } from '../../server/components/auth/entities';
import { PartTypeEntity } from '../../server/components/catalogue/entities';
import { DEMO_PASSWORD, seedDemoUsers } from '../../server/seed/demo-users';
import { createTestApp } from '../support/app';
import globalSetup from '../support/global-setup';
import { washerPhoto } from './photos';

const ROOT = path.join(__dirname, '..', '..');
const CHANGES = Number(process.env.KW_BENCH_CHANGES ?? 9);
const PHOTOS = [
  { fileName: 'washer-1.3mp.png', width: 1280, height: 1024 },
  { fileName: 'washer-5mp.png', width: 2592, height: 1944 },
];
const SET_NAME = 'Preview timing photos';
const PART_TYPE = 'preview-bench';

const STANDARD_RULE = {
  format: 'kernwright-rule/1',
  name: 'Preview timing',
  steps: [
    { op: 'gaussian', sigma: 1 },
    { op: 'gradient', operator: 'sobel', output: 'magnitude' },
    { op: 'threshold', method: 'otsu' },
    { op: 'open', radius: 1 },
  ],
  gauges: [{ name: 'Edge share', measure: 'edge-fraction', limits: { max: 0.5 } }],
};

function webBuild(): string {
  if (process.env.KW_WEB_DIR) return process.env.KW_WEB_DIR;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kw-preview-web-'));
  console.log(`exporting the web app into ${dir}`);
  execFileSync('npx', ['expo', 'export', '--platform', 'web', '--output-dir', dir], { cwd: ROOT, env: { ...process.env, CI: '1', EXPO_OFFLINE: '1' }, stdio: 'ignore' });
  return dir;
}

interface Reading {
  engineMs: number;
  engine: string;
  changeMs: number;
  /** The pause for typing the run waited, as the page says (0: none). */
  pauseMs: number;
}

const STATUS = /Engine (\d+) ms on ([^·]+?) · change to updated preview (\d+) ms(?: \(includes a (\d+) ms pause for typing\))?/;

/**
 * Resolves (in the page) with the preview's status once a run that started after this call has
 * finished and its figures are on screen: an observer sees "Updating…" come and go, then three frames
 * pass (the page measures the change-to-preview time in the frame after it draws).
 */
const WATCH_NEXT_RUN = `void (window.__kwNextRun = new Promise((resolve) => {
  const status = () => Array.from(document.querySelectorAll('[role="status"]')).map((e) => e.textContent || '').find((t) => /^(Updating… )?Engine /.test(t)) || '';
  let updating = false;
  const observer = new MutationObserver(() => {
    const text = status();
    if (text.startsWith('Updating')) updating = true;
    else if (updating) {
      observer.disconnect();
      requestAnimationFrame(() => requestAnimationFrame(() => requestAnimationFrame(() => resolve(status()))));
    }
  });
  observer.observe(document.body, { subtree: true, childList: true, characterData: true });
}))`;

/** Changes sigma, waits for the preview to run and draw, and reads the page's own figures. */
async function changeAndRead(page: Page, sigma: string): Promise<Reading> {
  await page.evaluate(WATCH_NEXT_RUN);
  await page.getByLabel('Sigma (px)').fill(sigma);
  const text = String(await page.evaluate('Promise.race([window.__kwNextRun, new Promise((r) => setTimeout(() => r("timed out"), 60000))])'));
  if (text === 'timed out') {
    await page.screenshot({ path: path.join(os.tmpdir(), 'kw-preview-timeout.png'), fullPage: true });
    throw new Error(`no preview run finished within 60 s of setting sigma to ${sigma}; statuses: ${(await page.getByRole('status').allTextContents()).join(' | ')}`);
  }
  const match = STATUS.exec(text);
  if (!match) throw new Error(`unexpected preview status: ${text}`);
  return { engineMs: Number(match[1]), engine: match[2].trim(), changeMs: Number(match[3]), pauseMs: Number(match[4] ?? 0) };
}

function bestAndMedian(values: number[]): string {
  const sorted = [...values].sort((a, b) => a - b);
  return `${sorted[0].toFixed(0)} / ${sorted[sorted.length >> 1].toFixed(0)}`;
}

async function measure(url: string, ruleId: string, withoutWebAssembly: boolean, label: string): Promise<void> {
  const context = await chromium.launchPersistentContext(fs.mkdtempSync(path.join(os.tmpdir(), 'kw-chromium-')), {
    executablePath: process.env.KW_CHROMIUM ?? '/usr/bin/chromium',
    headless: true,
    viewport: { width: 1280, height: 900 },
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  });
  try {
    if (withoutWebAssembly) await context.addInitScript('delete globalThis.WebAssembly');
    const page = await context.newPage();
    page.on('crash', () => console.error(`${label}: the page crashed`));
    page.on('pageerror', (err) => console.error(`${label}: page error: ${err.message}`));
    await page.goto(`${url}/sign-in`);
    await page.getByLabel('User name').fill('engineer');
    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByRole('navigation', { name: 'Main' }).waitFor();
    await page.goto(`${url}/rules/${ruleId}`);
    // The editor shows each step closed; its fields come with "Edit".
    await page.getByRole('button', { name: /^Edit Step \d+: Gaussian smoothing$/ }).click({ timeout: 60_000 });
    await page.getByLabel('Sigma (px)').waitFor({ timeout: 60_000 });
    await page.getByRole('radio', { name: new RegExp(SET_NAME) }).first().click();
    for (const photo of PHOTOS) {
      await page.getByRole('radio', { name: new RegExp(`^Photo ${photo.fileName.replace('.', '\\.')}`) }).click();
      await page.getByRole('heading', { name: /^Preview verdict: (PASS|FAIL|RETAKE)$/ }).waitFor({ timeout: 120_000 });
      await page.getByText(`${photo.width}×${photo.height}, 8-bit`).waitFor({ timeout: 120_000 });
      const pixels = ((photo.width * photo.height) / 1e6).toFixed(1);
      // Each change right after the last update (as typing comes), then each after a pause (as clicks
      // and drawn regions come): the first wait for the editor's pause for typing, the second run at
      // the next frame when the engine keeps up (hooks/previewPause.ts). One change first to warm up.
      for (const [mode, gapMs] of [['quick succession', 0], ['single changes', 400]] as const) {
        const readings: Reading[] = [];
        for (let i = 0; i <= CHANGES; i++) {
          if (gapMs > 0) await page.waitForTimeout(gapMs);
          const reading = await changeAndRead(page, i % 2 === 0 ? '1.1' : '1');
          if (i > 0) readings.push(reading);
        }
        const paused = readings.filter((r) => r.pauseMs > 0).length;
        console.log(
          `${label.padEnd(34)} ${`${pixels} MP`.padEnd(7)} ${mode.padEnd(17)} engine: ${readings[0].engine.padEnd(17)} change → updated preview ${bestAndMedian(readings.map((r) => r.changeMs))} ms` +
            ` (${paused} of ${readings.length} after the editor's pause for typing; without it ${bestAndMedian(readings.map((r) => r.changeMs - r.pauseMs))} ms); the engine's run ${bestAndMedian(readings.map((r) => r.engineMs))} ms`,
        );
      }
    }
  } finally {
    await context.close();
  }
}

async function main(): Promise<void> {
  const webDir = webBuild();
  await globalSetup();
  const product = await createTestApp({ webDir });
  const server: Server = await new Promise((resolve) => {
    const s = product.app.listen(0, '127.0.0.1', () => resolve(s));
  });
  try {
    const address = server.address();
    if (!address || typeof address === 'string') throw new Error('no address');
    const url = `http://127.0.0.1:${address.port}`;
    const ds = product.db.dataSource;
    await seedDemoUsers(ds);
    await ds.getRepository(PartTypeEntity).upsert({ code: PART_TYPE, name: 'Washer for preview timing', family: 'washer' }, ['code']);
    const engineer = await ds.getRepository(UserEntity).findOneByOrFail({ username: 'engineer' });
    const set = await product.services.references.createSet(engineer, { name: SET_NAME, partType: PART_TYPE, description: 'Generated washers at 1.3 and 5 MP' });
    const files = await Promise.all(
      PHOTOS.map(async (p) => {
        const photo = washerPhoto(p.width, p.height);
        return { fileName: p.fileName, bytes: await sharp(photo.samples, { raw: { width: p.width, height: p.height, channels: 1 } }).png().toBuffer() };
      }),
    );
    await product.services.references.addImages(engineer, set.id, files, { label: 'good' });
    const rule = await product.services.rules.create(engineer, { name: 'Preview timing', partType: PART_TYPE, smallestDefectMm: null, document: STANDARD_RULE });

    console.log(`Preview update in headless Chromium (${execFileSync(process.env.KW_CHROMIUM ?? '/usr/bin/chromium', ['--version']).toString().trim()}), ${os.cpus().length} cores, load average ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
    console.log(`${CHANGES} changes of the Gaussian's sigma per photo; ms best / median`);
    await measure(url, rule.id, false, 'browser as it is');
    await measure(url, rule.id, true, 'WebAssembly removed from the page');
    console.log(`load average at the end ${os.loadavg().map((l) => l.toFixed(2)).join(' ')}`);
  } finally {
    await new Promise<void>((resolve) => server.close(() => resolve()));
    await product.close();
  }
}

main().catch((e) => {
  console.error(e);
  process.exitCode = 1;
});
