import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { instrumentDetailSchema, instrumentSchema } from '@shared/api/instrument';
import { listResponseSchema } from '@shared/api/list';
import { useTestApp, type SignedInClient, byRole, everyRole } from '../support/test-app';
import { binary } from '../support/binary-body';

// A 1×1 PNG: the 8-byte signature 89 50 4E 47 0D 0A 1A 0A (PNG specification, "PNG signature"), IHDR, IDAT, IEND.
const onePixelPng = Buffer.from(
  'iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mNkYPhfDwAChwGA60e6kgAAAABJRU5ErkJggg==',
  'base64',
);

function upload(
  client: SignedInClient,
  instrumentId: number,
  bytes: Buffer,
  filename: string,
  contentType: string,
) {
  return client.upload(`/api/instruments/${instrumentId}/photos`, 'photo', bytes, {
    filename,
    contentType,
  });
}

function importCsv(client: SignedInClient, csv: string, dryRun: boolean) {
  return request(app.url)
    .post(`/api/instruments/import?dryRun=${dryRun}`)
    .set({ Cookie: client.cookie, Origin: app.url, 'Content-Type': 'text/csv' })
    .send(csv);
}

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, technician, viewer, student } = byRole(app.clients);

describe('Instruments', () => {
  it('should scope the fleet: a director sees their schools, the technician all, a student none', async () => {
    const mine = listResponseSchema(instrumentSchema).parse(
      (await director.get('/api/instruments?limit=1000')).body,
    );
    expect(mine.total).toBeGreaterThan(20);
    expect(new Set(mine.rows.map((row) => row.homeSchoolCode))).toEqual(new Set(['HPMS']));
    const everything = await technician.get('/api/instruments?limit=1');
    expect(everything.body.total).toBeGreaterThan(mine.total + 100);
    const elsewhere = (
      await coordinator.get(`/api/instruments?homeSchoolId=${app.schoolIds['QHMS']}&limit=1`)
    ).body.rows[0];
    expect((await director.get(`/api/instruments/${elsewhere.id}`)).status).toBe(404);
    expect((await technician.get(`/api/instruments/${elsewhere.id}`)).status).toBe(200);
    expect((await student.get('/api/instruments')).status).toBe(403);
  });

  it('should filter by status, family and search text and sort on the grid fields', async () => {
    const tubas = await coordinator.get('/api/instruments?instrumentId=tuba&limit=1000');
    expect(tubas.body.total).toBeGreaterThan(0);
    expect(
      tubas.body.rows.every((row: { instrumentId: string }) => row.instrumentId === 'tuba'),
    ).toBe(true);
    const strings = await coordinator.get('/api/instruments?family=strings&limit=1000');
    expect(strings.body.rows.every((row: { family: string }) => row.family === 'strings')).toBe(
      true,
    );
    const onLoan = await coordinator.get('/api/instruments?status=on-loan&limit=1000');
    expect(onLoan.body.rows.every((row: { status: string }) => row.status === 'on-loan')).toBe(
      true,
    );
    const sorted = await coordinator.get('/api/instruments?sort=purchasedOn:desc&limit=50');
    const dates = sorted.body.rows.map((row: { purchasedOn: string }) => row.purchasedOn);
    expect(dates).toEqual([...dates].sort().reverse());
    const tag = tubas.body.rows[0].assetTag as string;
    const found = await coordinator.get(
      `/api/instruments?q=${encodeURIComponent(tag.toLowerCase())}`,
    );
    expect(found.body.rows.map((row: { assetTag: string }) => row.assetTag)).toContain(tag);
  });

  it('should carry the heavy handling note on a tuba and the cleaning caution on winds only', async () => {
    const tuba = (await coordinator.get('/api/instruments?instrumentId=tuba&limit=1')).body.rows[0];
    // Heavy instruments travel in wheeled cases, carried by two (common practice, no source).
    expect(tuba.handlingNote).toMatch(/wheeled case/);
    expect(tuba.cleaningCaution).toMatch(/cleaned and sanitised/);
    const violin = (await coordinator.get('/api/instruments?instrumentId=violin&limit=1')).body
      .rows[0];
    expect(violin.handlingNote).toBeNull();
    expect(violin.cleaningCaution).toBeNull();
  });

  it('should create, edit with a version, and refuse a stale edit, a duplicate tag and read-only roles', async () => {
    const input = {
      assetTag: 'test-fleet-1',
      instrumentId: 'euphonium',
      homeSchoolId: app.schoolIds['HPMS'],
      maker: 'Carrow Brassworks',
      purchasedOn: '2025-02-14',
      purchaseCostCents: 310000,
    };
    expect((await director.post('/api/instruments', input)).status).toBe(403);
    expect((await viewer.post('/api/instruments', input)).status).toBe(403);
    const created = await technician.post('/api/instruments', input);
    expect(created.status).toBe(201);
    expect(created.body.assetTag).toBe('TEST-FLEET-1');
    expect((await coordinator.post('/api/instruments', input)).status).toBe(400);
    const bad = await coordinator.post('/api/instruments', {
      ...input,
      assetTag: 'TEST-FLEET-2',
      instrumentId: 'kazoo',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fieldErrors[0].field).toBe('instrumentId');
    const edited = await technician.patch(`/api/instruments/${created.body.id}`, {
      condition: 'fair',
      version: created.body.version,
    });
    expect(edited.status).toBe(200);
    const stale = await coordinator.patch(`/api/instruments/${created.body.id}`, {
      notes: 'late',
      version: created.body.version,
    });
    expect(stale.status).toBe(409);
    expect(
      (
        await viewer.patch(`/api/instruments/${created.body.id}`, {
          notes: 'x',
          version: edited.body.version,
        })
      ).status,
    ).toBe(403);
    const detail = instrumentDetailSchema.parse(
      (await director.get(`/api/instruments/${created.body.id}`)).body,
    );
    expect(detail.timeline.map((event) => event.kind)).toEqual(['condition-change', 'purchase']);
    expect(detail.activeLoan).toBeNull();
  });

  it('should print a labels PDF for a school', async () => {
    const response = await binary(
      director.get(`/api/instruments/labels.pdf?schoolId=${app.schoolIds['HPMS']}`),
    );
    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toMatch(/application\/pdf/);
    // ISO 32000-1 §7.5.2: a PDF file begins with the header %PDF-.
    expect((response.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect(
      (await director.get(`/api/instruments/labels.pdf?schoolId=${app.schoolIds['QHMS']}`)).status,
    ).toBe(404);
  });

  it('should print one instrument’s label where the next free label of a sheet is', async () => {
    const images = (pdf: Buffer) => pdf.toString('latin1').match(/\/Subtype \/Image/g)?.length ?? 0;
    const sheet = await binary(
      director.get(`/api/instruments/labels.pdf?schoolId=${app.schoolIds['HPMS']}`),
    );
    const instrument = (
      await director.get(`/api/instruments?homeSchoolId=${app.schoolIds['HPMS']}&limit=1`)
    ).body.rows[0];
    const one = await binary(
      director.get(`/api/instruments/labels.pdf?instrumentId=${instrument.id}&skip=4`),
    );
    expect(one.status).toBe(200);
    expect((one.body as Buffer).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    // Each label carries the same images (its QR code): the school's sheet has as many sets as
    // the school has instruments, the single label's sheet one set.
    const total = (
      await director.get(`/api/instruments?homeSchoolId=${app.schoolIds['HPMS']}&limit=1`)
    ).body.total as number;
    expect(total).toBeGreaterThan(1);
    expect(images(one.body as Buffer)).toBeGreaterThan(0);
    expect(images(sheet.body as Buffer)).toBe(images(one.body as Buffer) * total);
    expect(
      (await director.get(`/api/instruments/labels.pdf?instrumentId=${instrument.id}&skip=30`))
        .status,
    ).toBe(400);
    const elsewhere = (
      await coordinator.get(`/api/instruments?homeSchoolId=${app.schoolIds['QHMS']}&limit=1`)
    ).body.rows[0];
    expect(
      (await director.get(`/api/instruments/labels.pdf?instrumentId=${elsewhere.id}`)).status,
    ).toBe(404);
  });

  it('should keep a photo whose bytes are an image and refuse one that only claims to be', async () => {
    const instrument = (await coordinator.get('/api/instruments?limit=1')).body.rows[0];
    const kept = await upload(technician, instrument.id, onePixelPng, 'bell.png', 'image/png');
    expect(kept.status).toBe(201);
    expect(kept.body.contentType).toBe('image/png');
    const photo = await binary(coordinator.get(kept.body.url));
    expect(photo.status).toBe(200);
    expect(Buffer.compare(photo.body as Buffer, onePixelPng)).toBe(0);
    const fake = await upload(
      technician,
      instrument.id,
      Buffer.from('<svg onload="alert(1)"></svg>'),
      'bell.png',
      'image/png',
    );
    expect(fake.status).toBe(400);
    const tooLarge = Buffer.concat([onePixelPng, Buffer.alloc(5 * 1024 * 1024)]);
    expect((await upload(technician, instrument.id, tooLarge, 'big.png', 'image/png')).status).toBe(
      413,
    );
    expect(
      (await upload(director, instrument.id, onePixelPng, 'bell.png', 'image/png')).status,
    ).toBe(403);
    const detail = await coordinator.get(`/api/instruments/${instrument.id}`);
    expect(detail.body.photos).toHaveLength(1);
  });
});

describe('Fleet import', () => {
  const header =
    'asset_tag,instrument,maker,model,serial,purchased_on,purchase_cost,funding_source,condition,home_school_code';

  it('should preview, then commit all rows, then find them unchanged', async () => {
    const csv = [
      header,
      'IMP-001,Tuba,Carrow Brassworks,T-4,55501,2019-08-01,"5,150.00",2016 facilities bond,good,HPMS',
      'IMP-002,Baritone Sax,Harrowgate Winds,B-2,55502,2020-01-15,4700,Music boosters,fair,QHMS',
    ].join('\n');
    const preview = await importCsv(coordinator, csv, true);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({
      rows: 2,
      created: 2,
      updated: 0,
      unchanged: 0,
      errors: [],
      committed: false,
    });
    expect((await coordinator.get('/api/instruments?q=IMP-00')).body.total).toBe(0);
    const committed = await importCsv(coordinator, csv, false);
    expect(committed.body).toMatchObject({ created: 2, committed: true });
    const tuba = (await coordinator.get('/api/instruments?q=IMP-001')).body.rows[0];
    expect(tuba).toMatchObject({
      instrumentId: 'tuba',
      purchaseCostCents: 515000,
      purchasedOn: '2019-08-01',
      homeSchoolCode: 'HPMS',
    });
    const again = await importCsv(coordinator, csv.replace('B-2', 'B-3'), false);
    expect(again.body).toMatchObject({ created: 0, updated: 1, unchanged: 1, committed: true });
  });

  it('should name the line and column of every error and commit nothing', async () => {
    const csv = [
      header,
      'IMP-100,Tuba,,,,,,,,HPMS',
      'IMP-101,Kazoo,,,,2020-13-01,cheap,,shiny,ZZZZ',
      'IMP-100,Tuba,,,,,,,,HPMS',
    ].join('\n');
    const response = await importCsv(coordinator, csv, false);
    expect(response.body.committed).toBe(false);
    const places = response.body.errors.map(
      (error: { line: number; column: string }) => `${error.line}:${error.column}`,
    );
    expect(places).toEqual(
      expect.arrayContaining([
        '3:instrument',
        '3:purchased_on',
        '3:purchase_cost',
        '3:condition',
        '3:home_school_code',
        '4:asset_tag',
      ]),
    );
    expect((await coordinator.get('/api/instruments?q=IMP-10')).body.total).toBe(0);
    expect((await director.post('/api/instruments/import?dryRun=true', {})).status).toBe(403);
  });
});
