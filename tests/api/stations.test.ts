import request from 'supertest';
import { lineSchema, stationSchema } from '../../shared/api/stations';
import { createTestApp, type TestApp } from '../support/app';

let t: TestApp;
let supervisor: { Authorization: string };
beforeAll(async () => {
  t = await createTestApp();
  await t.createUser('mara', ['supervisor']);
  await t.createUser('tomas', ['operator']);
  supervisor = { Authorization: `Bearer ${await t.tokenFor('mara')}` };
});
afterAll(() => t.close());

test('a supervisor creates a line and a station, then calibrates it from a target of known length', async () => {
  const line = lineSchema.parse((await request(t.app).post('/api/stations/lines').set(supervisor).send({ name: 'Line 1 — presses' })).body);
  const created = await request(t.app).post('/api/stations').set(supervisor).send({ lineId: line.id, name: 'Press 1 exit', cameraNote: '5 MP, 35 mm lens, 420 mm above the belt' });
  expect(created.status).toBe(201);
  const station = stationSchema.parse(created.body);
  expect(station).toMatchObject({ lineName: 'Line 1 — presses', mmPerPx: null, calibratedAt: null });

  // REFERENCES.md §8: a 10.00 mm reference spanning 400.0 px gives 0.025 mm/px; u = s/√12 (GUM F.2.2.1).
  const calibrated = stationSchema.parse((await request(t.app).post(`/api/stations/${station.id}/calibration`).set(supervisor).send({ referenceLengthMm: 10, distancePx: 400 })).body);
  expect(calibrated.mmPerPx).toBeCloseTo(0.025, 12);
  expect(calibrated.quantisationUncertaintyMm).toBeCloseTo(0.025 / Math.sqrt(12), 12);
  expect(calibrated.calibratedBy).toBe('Test mara');
  expect(Date.parse(calibrated.calibratedAt!)).toBeLessThanOrEqual(Date.now());

  const [event] = await t.db.dataSource.query(`select details from audit_events where action = 'station.calibrate'`);
  expect(event.details).toMatchObject({ referenceLengthMm: 10, distancePx: 400, previousMmPerPx: null });
});

test('a calibration needs positive numbers', async () => {
  const [line] = (await request(t.app).get('/api/stations/lines').set(supervisor)).body.items;
  const id = line.stations[0].id;
  const res = await request(t.app).post(`/api/stations/${id}/calibration`).set(supervisor).send({ referenceLengthMm: 10, distancePx: 0 });
  expect(res.status).toBe(400);
  expect(res.body.error.details.issues[0].path).toBe('distancePx');
});

// Common practice: a pixel scale holds only for the image size it was measured in, so the calibration
// keeps that size (DESIGN.md, "Image quality gate": size); the product's own rule asks for whole, positive pixels.
test('a calibration stores and returns the photo size its scale holds for, and keeps it in the audit trail', async () => {
  const [line] = (await request(t.app).get('/api/stations/lines').set(supervisor)).body.items;
  const id = line.stations[0].id;
  expect(line.stations[0]).toMatchObject({ photoWidthPx: null, photoHeightPx: null });
  const res = await request(t.app).post(`/api/stations/${id}/calibration`).set(supervisor).send({ referenceLengthMm: 20, distancePx: 228.57, photoWidthPx: 2592, photoHeightPx: 1944 });
  expect(res.status).toBe(200);
  expect(stationSchema.parse(res.body)).toMatchObject({ photoWidthPx: 2592, photoHeightPx: 1944 });
  expect((await request(t.app).get(`/api/stations/${id}`).set(supervisor)).body).toMatchObject({ photoWidthPx: 2592, photoHeightPx: 1944 });
  const [event] = await t.db.dataSource.query(`select details from audit_events where action = 'station.calibrate' order by seq desc limit 1`);
  expect(event.details).toMatchObject({ photoWidthPx: 2592, photoHeightPx: 1944, previousPhotoWidthPx: null, previousPhotoHeightPx: null });
});

test.each([
  ['zero', { photoWidthPx: 0, photoHeightPx: 1944 }, 'photoWidthPx'],
  ['negative', { photoWidthPx: 2592, photoHeightPx: -1944 }, 'photoHeightPx'],
  ['fractional', { photoWidthPx: 2592.5, photoHeightPx: 1944 }, 'photoWidthPx'],
  ['one side alone', { photoWidthPx: 2592 }, 'photoHeightPx'],
])('a calibration refuses a photo size that is %s, and keeps the one it had', async (_case, size, path) => {
  const [line] = (await request(t.app).get('/api/stations/lines').set(supervisor)).body.items;
  const id = line.stations[0].id;
  const res = await request(t.app).post(`/api/stations/${id}/calibration`).set(supervisor).send({ referenceLengthMm: 10, distancePx: 400, ...size });
  expect(res.status).toBe(400);
  expect(res.body.error.details.issues.map((i: { path: string }) => i.path)).toEqual([path]);
  expect((await request(t.app).get(`/api/stations/${id}`).set(supervisor)).body).toMatchObject({ photoWidthPx: 2592, photoHeightPx: 1944 });
});

test('a calibration without a photo size (an older script) still calibrates, and records no size', async () => {
  const [line] = (await request(t.app).get('/api/stations/lines').set(supervisor)).body.items;
  const id = line.stations[0].id;
  const res = await request(t.app).post(`/api/stations/${id}/calibration`).set(supervisor).send({ referenceLengthMm: 10, distancePx: 400 });
  expect(res.status).toBe(200);
  expect(res.body).toMatchObject({ mmPerPx: 0.025, photoWidthPx: null, photoHeightPx: null });
});

test('operators may list stations but not change them', async () => {
  const operator = { Authorization: `Bearer ${await t.tokenFor('tomas')}` };
  const lines = await request(t.app).get('/api/stations/lines').set(operator);
  expect(lines.status).toBe(200);
  const id = lines.body.items[0].stations[0].id;
  expect((await request(t.app).patch(`/api/stations/${id}`).set(operator).send({ active: false })).status).toBe(403);
  expect((await request(t.app).post(`/api/stations/${id}/calibration`).set(operator).send({ referenceLengthMm: 1, distancePx: 1 })).status).toBe(403);
  expect((await request(t.app).post('/api/stations/lines').set(operator).send({ name: 'x' })).status).toBe(403);
});

test('station names are unique within a line', async () => {
  const [line] = (await request(t.app).get('/api/stations/lines').set(supervisor)).body.items;
  const res = await request(t.app).post('/api/stations').set(supervisor).send({ lineId: line.id, name: 'Press 1 exit' });
  expect(res.status).toBe(409);
});
