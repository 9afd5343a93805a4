import { beforeAll, describe, expect, it } from 'vitest';
import { countDetailSchema } from '@shared/api/count';
import { instrumentDetailSchema } from '@shared/api/instrument';
import { useTestApp } from '../support/test-app';

let hpms: number;

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'technician'] });
const { coordinator, 'director.hpms': director, technician } = app.clients;
beforeAll(async () => {
  hpms = app.schoolIds['HPMS']!;
});

async function newInstrument(assetTag: string, purchasedOn: string | null) {
  const created = await coordinator.post('/api/instruments', {
    assetTag,
    instrumentId: 'trumpet',
    maker: 'Fernwick',
    model: 'T-2',
    homeSchoolId: hpms,
    condition: 'good',
    purchasedOn,
  });
  expect(created.status, JSON.stringify(created.body)).toBe(201);
  return created.body as { id: number; assetTag: string };
}

describe('An instrument’s timeline', () => {
  it('should name the student of a loan, with their id, only to roles that may see students', async () => {
    const instrument = await newInstrument('HP-TL-0001', '2019-08-15');
    const student = (await director.get(`/api/students?schoolId=${hpms}&status=active&limit=1`))
      .body.rows[0] as {
      id: number;
      studentNumber: string;
      firstName: string;
      lastName: string;
      preferredName: string | null;
    };
    const lent = await director.post('/api/loans', {
      instrumentId: instrument.id,
      studentId: student.id,
      conditionOut: 'good',
    });
    expect(lent.status, JSON.stringify(lent.body)).toBe(201);
    const seen = instrumentDetailSchema.parse(
      (await director.get(`/api/instruments/${instrument.id}`)).body,
    );
    const loanOut = seen.timeline.find((event) => event.kind === 'loan-out')!;
    expect(loanOut.studentName).toBe(
      `${student.preferredName ?? student.firstName} ${student.lastName}`,
    );
    expect(loanOut.studentNumber).toBe(student.studentNumber);
    // Purchased, on the day it was bought.
    const purchase = seen.timeline.find((event) => event.kind === 'purchase')!;
    expect(purchase.at.slice(0, 10)).toBe('2019-08-15');
    // The technician looks after the fleet but does not see students (server/core/policy.ts).
    const technicianView = instrumentDetailSchema.parse(
      (await technician.get(`/api/instruments/${instrument.id}`)).body,
    );
    const unnamed = technicianView.timeline.find((event) => event.kind === 'loan-out')!;
    expect(unnamed.studentName).toBeNull();
    expect(unnamed.studentNumber).toBeNull();
  });

  it('should say "added", not "purchased", when no purchase date is known', async () => {
    const instrument = await newInstrument('HP-TL-0002', null);
    const detail = instrumentDetailSchema.parse(
      (await coordinator.get(`/api/instruments/${instrument.id}`)).body,
    );
    expect(detail.timeline.map((event) => event.kind)).toContain('added');
    expect(detail.timeline.map((event) => event.kind)).not.toContain('purchase');
  });
});

describe('The annual count', () => {
  it('should flag an instrument scanned on the shelf while its repair ticket says it is at the vendor', async () => {
    const atVendor = await newInstrument('HP-TL-0003', null);
    const onShelf = await newInstrument('HP-TL-0004', null);
    const ticket = await technician.post('/api/repairs', {
      instrumentId: atVendor.id,
      problem: 'Dented leadpipe',
      vendor: 'Millrace Instrument Repair',
    });
    expect(ticket.status).toBe(201);
    const sent = await technician.patch(`/api/repairs/${ticket.body.id}`, {
      status: 'sent',
      version: ticket.body.version,
    });
    expect(sent.status).toBe(200);
    const started = await director.post('/api/counts', { schoolId: hpms });
    expect(started.status).toBe(201);
    for (const tag of [atVendor.assetTag, onShelf.assetTag]) {
      expect(
        (await director.post(`/api/counts/${started.body.id}/scans`, { assetTag: tag })).status,
      ).toBe(201);
    }
    const detail = countDetailSchema.parse(
      (await director.get(`/api/counts/${started.body.id}`)).body,
    );
    expect(detail.reconciliation.atVendor).toEqual([
      expect.objectContaining({
        id: atVendor.id,
        assetTag: atVendor.assetTag,
        repairId: ticket.body.id,
        vendor: 'Millrace Instrument Repair',
        sentOn: sent.body.sentOn,
      }),
    ]);
  });
});
