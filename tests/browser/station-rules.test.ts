// Stations inspect part types (issue 6: "the operator chooses a station and one of its released
// rules"). On the demo plant, where each station inspects its family's part type: at phone width the
// operator is offered only the chosen station's rules, a remembered rule that no longer fits is
// dropped, and a station without part types (or without released rules for them) says so; a
// supervisor assigns part types in the station editor at phone and wide widths.
import type { BrowserContext, Page } from 'playwright-core';
import { UserEntity } from '../../server/components/auth/entities';
import { launchBrowser, PHONE, screenshot, seedPlantIntoProduct, startProduct, watchErrors, WIDE, type RunningProduct, signInAs } from '../support/browser';

jest.setTimeout(600_000);

let product: RunningProduct;
let supervisor: UserEntity;
const query = (sql: string, params: unknown[] = []) => product.db.dataSource.query(sql, params);
const stationId = async (name: string): Promise<string> => (await query(`select id from stations where name = $1`, [name]))[0].id;
const partTypesOf = async (name: string): Promise<string[]> =>
  (await query(`select p.part_type from station_part_types p join stations s on s.id = p.station_id where s.name = $1 order by p.part_type`, [name])).map((r: { part_type: string }) => r.part_type);

/** The open dialog's panel (react-native-web's Modal wraps it in a second, unnamed dialog element). */
const openDialog = (page: Page) => page.locator('[role="dialog"][aria-labelledby]');

beforeAll(async () => {
  product = await startProduct();
  await seedPlantIntoProduct(product, { referencePhotos: 6, historyDays: 1, perStationPerDay: 1 });
  supervisor = await product.db.dataSource.getRepository(UserEntity).findOneByOrFail({ username: 'supervisor' });
  const { stations } = product.services;
  const [line] = await stations.lines();
  // A part type nobody has written a rule for yet, inspected at a bench of its own; and a bench set up with no part types.
  await query(`insert into part_types (code, name, family) values ('kw-cl-12', 'Spring clip 12', 'clip')`);
  await stations.createStation(supervisor, { lineId: line.id, name: 'Clip bench', cameraNote: '', partTypes: ['kw-cl-12'] });
  await stations.createStation(supervisor, { lineId: line.id, name: 'Spare bench', cameraNote: '' });
});
afterAll(() => product?.close());

const signIn = (page: Page, username: string) => signInAs(page, product.url, username);

/** The names of the rules offered, in the order shown. */
async function offeredRules(page: Page): Promise<string[]> {
  const group = page.getByRole('radiogroup', { name: /^Released rules/ });
  if ((await group.count()) === 0) return [];
  return (await group.getByRole('radio').allTextContents()).map((label) => label.replace(/^✓ /, '').replace(/ · v\d+$/, ''));
}

test('the demo plant assigns each station the part type of its family', async () => {
  expect(await partTypesOf('Press 3 exit')).toEqual(['kw-br-6030']);
  expect(await partTypesOf('Deburr cell')).toEqual(['kw-br-6030']);
  expect(await partTypesOf('Lathe 7 exit')).toEqual(['kw-wa-m16']);
  expect(await partTypesOf('Moulding press 2')).toEqual(['kw-gr-5038']);
});

describe('the operator at phone width', () => {
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];
  beforeAll(async () => {
    browser = await launchBrowser(PHONE);
    page = await browser.newPage();
    errors = watchErrors(page);
    await signIn(page, 'operator');
    await page.goto(`${product.url}/inspect`);
  });
  afterAll(() => browser?.close());

  test('is offered only the released rules for the chosen station’s part type', async () => {
    await page.getByText('Choose your station first', { exact: false }).waitFor();
    expect(await offeredRules(page)).toEqual([]);

    await page.getByRole('radio', { name: 'Press 3 exit' }).click();
    await page.getByRole('radiogroup', { name: 'Released rules for Stamped bracket 60×30' }).waitFor();
    expect(await offeredRules(page)).toEqual(['Bracket hole and edge check']);
    await screenshot(page, 'inspect-station-rules-phone');

    await page.getByRole('radio', { name: 'Lathe 7 exit' }).click();
    await page.getByRole('radiogroup', { name: 'Released rules for Machined washer M16' }).waitFor();
    expect(await offeredRules(page)).toEqual(['Washer rim and bore check']);
  });

  test('a station with no part types offers every released rule and says why', async () => {
    await page.getByRole('radio', { name: 'Spare bench' }).click();
    await page.getByText('No part types assigned to this station yet: every released rule is offered. A supervisor can assign them under Stations.').waitFor();
    expect((await offeredRules(page)).sort()).toEqual(['Bracket hole and edge check', 'Gasket ring defects', 'Washer rim and bore check']);
    await screenshot(page, 'inspect-station-unassigned-phone');
  });

  test('a station whose part types have no released rule names them', async () => {
    await page.getByRole('radio', { name: 'Clip bench' }).click();
    await page.getByText('No released rule for Spring clip 12 yet').waitFor();
    expect(await offeredRules(page)).toEqual([]);
    expect(await page.getByRole('button', { name: 'Use this station and rule' }).isDisabled()).toBe(true);
    await screenshot(page, 'inspect-station-no-rules-phone');
  });

  test('a remembered rule that no longer fits the station is dropped', async () => {
    await page.getByRole('radio', { name: 'Lathe 7 exit' }).click();
    await page.getByRole('radio', { name: /^Washer rim and bore check/ }).click();
    // The chosen rule stays chosen only while it fits the station.
    await page.getByRole('radio', { name: 'Press 3 exit' }).click();
    expect(await page.getByRole('button', { name: 'Use this station and rule' }).isDisabled()).toBe(true);
    await page.getByRole('radio', { name: 'Lathe 7 exit' }).click();
    expect(await page.getByRole('radio', { name: /^Washer rim and bore check/ }).getAttribute('aria-checked')).toBe('false');
    await page.getByRole('radio', { name: /^Washer rim and bore check/ }).click();
    await page.getByRole('button', { name: 'Use this station and rule' }).click();
    await page.getByRole('button', { name: 'Photograph part' }).waitFor();

    // A supervisor moves Lathe 7 to gaskets: the washer rule this device remembered no longer fits there.
    const lathe = await stationId('Lathe 7 exit');
    await product.services.stations.update(supervisor, lathe, { partTypes: ['kw-gr-5038'] });
    try {
      await page.reload();
      await page.getByText('⚠ Lathe 7 exit no longer inspects the part type of the rule this device remembered').waitFor();
      expect(await page.getByRole('button', { name: 'Photograph part' }).count()).toBe(0);
      expect(await page.getByRole('radio', { name: 'Lathe 7 exit' }).getAttribute('aria-checked')).toBe('true');
      expect(await offeredRules(page)).toEqual(['Gasket ring defects']);
      expect(await page.getByRole('button', { name: 'Use this station and rule' }).isDisabled()).toBe(true);
      await screenshot(page, 'inspect-remembered-rule-dropped-phone');
    } finally {
      await product.services.stations.update(supervisor, lathe, { partTypes: ['kw-wa-m16'] });
    }
    expect(errors).toEqual([]);
  });
});

describe.each([
  ['phone', PHONE, 'Spare bench', 'Stamped bracket 60×30', ['kw-br-6030']],
  ['wide', WIDE, 'Moulding press 2', 'Machined washer M16', ['kw-gr-5038', 'kw-wa-m16']],
] as const)('the supervisor at %s width', (widthName, viewport, station, tick, expected) => {
  let browser: BrowserContext;
  let page: Page;
  let errors: string[];
  beforeAll(async () => {
    browser = await launchBrowser(viewport);
    page = await browser.newPage();
    errors = watchErrors(page);
    await signIn(page, 'supervisor');
  });
  afterAll(() => browser?.close());

  test('ticks the part types a station inspects in its editor', async () => {
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Stations' }).click();
    await page.getByText('Inspects: Stamped bracket 60×30').first().waitFor();
    await screenshot(page, `stations-part-types-list-${widthName}`);
    await page.getByRole('button', { name: `Edit ${station}` }).click();
    const dialog = openDialog(page);
    const box = dialog.getByRole('checkbox', { name: tick });
    expect(await box.getAttribute('aria-checked')).toBe('false');
    await box.click();
    expect(await box.getAttribute('aria-checked')).toBe('true');
    await screenshot(page, `stations-part-types-editor-${widthName}`);
    await dialog.getByRole('button', { name: 'Save changes' }).click();
    await dialog.waitFor({ state: 'hidden' });
    expect(await partTypesOf(station)).toEqual(expected);
    const [event] = await query(`select details from audit_events where action = 'station.update' and entity_id = $1 order by seq desc limit 1`, [await stationId(station)]);
    expect(event.details.after.partTypes).toEqual(expected);
    expect(errors).toEqual([]);
  });
});
