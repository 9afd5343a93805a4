import { beforeAll, describe, expect, it } from 'vitest';
import { listResponseSchema } from '@shared/api/list';
import { repairSchema } from '@shared/api/repair';
import { useTestApp } from '../support/test-app';

let hpmsId: number;
let tagNumber = 0;

async function newInstrument(): Promise<{ id: number }> {
  const response = await coordinator.post('/api/instruments', {
    assetTag: `TEST-REPAIR-${(tagNumber += 1)}`,
    instrumentId: 'horn',
    homeSchoolId: hpmsId,
  });
  return response.body;
}

const statusOf = async (id: number) =>
  (await coordinator.get(`/api/instruments/${id}`)).body.status;

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'technician'] });
const { coordinator, 'director.hpms': director, technician } = app.clients;
beforeAll(async () => {
  hpmsId = app.schoolIds['HPMS']!;
});

describe('Repairs', () => {
  it('should keep the instrument in repair while any ticket is open and free it when the last closes', async () => {
    const instrument = await newInstrument();
    const first = await technician.post('/api/repairs', {
      instrumentId: instrument.id,
      problem: 'Stuck rotor valve',
    });
    expect(first.status).toBe(201);
    expect(repairSchema.parse(first.body).inHouse).toBe(true);
    expect(await statusOf(instrument.id)).toBe('in-repair');
    const second = await technician.post('/api/repairs', {
      instrumentId: instrument.id,
      problem: 'Dented slide',
      vendor: 'Millrace Instrument Repair',
      estimateCents: 12000,
    });
    expect(second.body.inHouse).toBe(false);
    const sent = await technician.patch(`/api/repairs/${second.body.id}`, {
      status: 'sent',
      version: second.body.version,
    });
    expect(sent.body.sentOn).toMatch(/^\d{4}-\d{2}-\d{2}$/);
    const closedFirst = await technician.patch(`/api/repairs/${first.body.id}`, {
      status: 'closed',
      finalCostCents: 0,
      version: first.body.version,
    });
    expect(closedFirst.status).toBe(200);
    expect(await statusOf(instrument.id)).toBe('in-repair');
    const returned = await technician.patch(`/api/repairs/${second.body.id}`, {
      status: 'returned',
      finalCostCents: 13500,
      version: sent.body.version,
    });
    expect(returned.body.returnedOn).not.toBeNull();
    expect(await statusOf(instrument.id)).toBe('available');
    const stale = await technician.patch(`/api/repairs/${second.body.id}`, {
      notes: 'late',
      version: sent.body.version,
    });
    expect(stale.status).toBe(409);
    const kinds = (await coordinator.get(`/api/instruments/${instrument.id}`)).body.timeline.map(
      (event: { kind: string }) => event.kind,
    );
    expect(kinds.filter((kind: string) => kind === 'repair-open')).toHaveLength(2);
    expect(kinds.filter((kind: string) => kind === 'repair-close')).toHaveLength(2);
  });

  it('should refuse a ticket for an instrument out on loan, and let directors read but not write', async () => {
    const onLoan = (
      await coordinator.get(`/api/instruments?status=on-loan&homeSchoolId=${hpmsId}&limit=1`)
    ).body.rows[0];
    const refused = await technician.post('/api/repairs', {
      instrumentId: onLoan.id,
      problem: 'Squeaks',
    });
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toMatch(/return/);
    const instrument = await newInstrument();
    expect(
      (await director.post('/api/repairs', { instrumentId: instrument.id, problem: 'Sticky key' }))
        .status,
    ).toBe(403);
    const list = listResponseSchema(repairSchema).parse(
      (await director.get('/api/repairs?limit=1000')).body,
    );
    expect(list.rows.every((row) => row.homeSchoolCode === 'HPMS')).toBe(true);
    const everywhere = await technician.get('/api/repairs?open=true&limit=1000');
    expect(
      everywhere.body.rows.every(
        (row: { status: string }) => row.status === 'open' || row.status === 'sent',
      ),
    ).toBe(true);
    const elsewhere = everywhere.body.rows.find(
      (row: { homeSchoolCode: string }) => row.homeSchoolCode !== 'HPMS',
    );
    expect((await director.get(`/api/repairs/${elsewhere.id}`)).status).toBe(404);
  });
});
