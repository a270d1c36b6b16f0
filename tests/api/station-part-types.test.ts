// Stations inspect part types (issue 6: "the operator chooses a station and one of its released
// rules"): assigning them, the station DTO, who may, and the inspection refused at a station that
// does not inspect the rule's part type.
import request from 'supertest';
import { stationSchema, type Station } from '../../shared/api/stations';
import { createTestApp, type TestApp } from '../support/app';
import { spotPhoto, SPOT_RULE } from '../support/photos';
import { releasedRule, type ReleasedRuleSetup } from '../support/released-rule';

jest.setTimeout(60_000);

let t: TestApp;
let supervisor: { Authorization: string };
let plate: ReleasedRuleSetup;
let lineId: string;

const auth = async (username: string) => ({ Authorization: `Bearer ${await t.tokenFor(username)}` });

beforeAll(async () => {
  t = await createTestApp();
  // A released rule for part type "plate", at a station set up with no part types assigned.
  plate = await releasedRule(t, SPOT_RULE, { partType: 'plate' });
  await t.db.dataSource.query(`insert into part_types (code, name, family) values ('washer-m8', 'Washer M8', 'washer'), ('gasket-50', 'Gasket 50', 'gasket')`);
  await t.createUser('mara', ['supervisor']);
  await t.createUser('ines', ['engineer']);
  await t.createUser('tomas', ['operator']);
  await t.createUser('ada', ['admin']);
  supervisor = await auth('mara');
  lineId = (await request(t.app).get('/api/stations/lines').set(supervisor)).body.items[0].id;
});
afterAll(() => t.close());

const createStation = (name: string, partTypes: string[], as = supervisor) => request(t.app).post('/api/stations').set(as).send({ lineId, name, partTypes });

const inspectAt = async (stationId: string, key: string) =>
  request(t.app)
    .post('/api/inspections')
    .set(await auth('tomas'))
    .field('stationId', stationId)
    .field('ruleVersionId', plate.releasedId)
    .field('idempotencyKey', key)
    .attach('photo', await spotPhoto(1, 2), { filename: 'part.png', contentType: 'image/png' });

test('a supervisor assigns part types to a new station; the DTO lists them sorted, wherever the station is shown', async () => {
  const res = await createStation('Washer and plate cell', ['washer-m8', 'plate']);
  expect(res.status).toBe(201);
  const station = stationSchema.parse(res.body);
  expect(station.partTypes).toEqual(['plate', 'washer-m8']);
  expect(stationSchema.parse((await request(t.app).get(`/api/stations/${station.id}`).set(supervisor)).body).partTypes).toEqual(['plate', 'washer-m8']);
  const listed = (await request(t.app).get('/api/stations/lines').set(supervisor)).body.items.flatMap((l: { stations: Station[] }) => l.stations);
  expect(listed.find((s: Station) => s.id === station.id).partTypes).toEqual(['plate', 'washer-m8']);
  // A station created without them inspects none yet.
  expect(listed.find((s: Station) => s.id === plate.stationId).partTypes).toEqual([]);
});

test('an administrator changes a station’s part types; the audit event keeps them before and after', async () => {
  const created = stationSchema.parse((await createStation('Gasket bench', ['plate'])).body);
  const res = await request(t.app).patch(`/api/stations/${created.id}`).set(await auth('ada')).send({ partTypes: ['gasket-50', 'washer-m8'] });
  expect(res.status).toBe(200);
  expect(stationSchema.parse(res.body).partTypes).toEqual(['gasket-50', 'washer-m8']);

  const events = await t.db.dataSource.query(`select action, actor_name, details from audit_events where entity_id = $1 order by seq`, [created.id]);
  expect(events.map((e: { action: string }) => e.action)).toEqual(['station.create', 'station.update']);
  expect(events[0].details.partTypes).toEqual(['plate']);
  expect(events[1].actor_name).toBe('ada');
  expect(events[1].details.before.partTypes).toEqual(['plate']);
  expect(events[1].details.after.partTypes).toEqual(['gasket-50', 'washer-m8']);

  // Changing only the name leaves the part types as they were.
  const renamed = await request(t.app).patch(`/api/stations/${created.id}`).set(supervisor).send({ name: 'Gasket bench 2' });
  expect(stationSchema.parse(renamed.body).partTypes).toEqual(['gasket-50', 'washer-m8']);
  // An empty list unassigns them all.
  const cleared = await request(t.app).patch(`/api/stations/${created.id}`).set(supervisor).send({ partTypes: [] });
  expect(stationSchema.parse(cleared.body).partTypes).toEqual([]);
});

test('an unknown part type is refused with its path named, and nothing is stored', async () => {
  const res = await createStation('Sprocket cell', ['plate', 'sprocket-12']);
  // The API's one validation status (server/lib/errors.ts: validation_failed → 400).
  expect(res.status).toBe(400);
  expect(res.body.error.code).toBe('validation_failed');
  expect(res.body.error.details.issues).toEqual([{ path: 'partTypes[1]', message: 'Unknown part type "sprocket-12"' }]);
  const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from stations where name = 'Sprocket cell'`);
  expect(n).toBe(0);

  const patched = await request(t.app).patch(`/api/stations/${plate.stationId}`).set(supervisor).send({ partTypes: ['nope-1'] });
  expect(patched.status).toBe(400);
  expect(patched.body.error.details.issues[0].path).toBe('partTypes[0]');

  const twice = await createStation('Twice cell', ['plate', 'plate']);
  expect(twice.status).toBe(400);
  expect(twice.body.error.details.issues[0].path).toBe('partTypes');
});

test('engineers and operators may not assign part types', async () => {
  for (const who of ['ines', 'tomas']) {
    const as = await auth(who);
    expect((await createStation(`Cell of ${who}`, ['plate'], as)).status).toBe(403);
    expect((await request(t.app).patch(`/api/stations/${plate.stationId}`).set(as).send({ partTypes: ['plate'] })).status).toBe(403);
  }
  const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from station_part_types where station_id = $1`, [plate.stationId]);
  expect(n).toBe(0);
});

test('a station that inspects other part types refuses the rule (409, naming both); one that inspects it accepts', async () => {
  const washers = stationSchema.parse((await createStation('Washer only', ['washer-m8'])).body);
  const refused = await inspectAt(washers.id, 'key-refused-001');
  expect(refused.status).toBe(409);
  expect(refused.body.error.code).toBe('conflict');
  expect(refused.body.error.message).toContain('Washer only');
  expect(refused.body.error.message).toContain('"plate"');
  expect(refused.body.error.message).toContain('"washer-m8"');
  const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from inspections where station_id = $1`, [washers.id]);
  expect(n).toBe(0);

  const plates = stationSchema.parse((await createStation('Plate and gasket', ['gasket-50', 'plate'])).body);
  const accepted = await inspectAt(plates.id, 'key-accepted-01');
  expect(accepted.status).toBe(201);
  expect(accepted.body.stationName).toBe('Plate and gasket');
});

test('a station with no part types assigned still accepts every released rule', async () => {
  const [{ n }] = await t.db.dataSource.query(`select count(*)::int as n from station_part_types where station_id = $1`, [plate.stationId]);
  expect(n).toBe(0);
  const res = await inspectAt(plate.stationId, 'key-unassigned1');
  expect(res.status).toBe(201);
});
