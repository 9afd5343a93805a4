import { describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { loanSchema } from '@shared/api/loan';
import { listResponseSchema } from '@shared/api/list';
import { rowsOf } from '../../server/db/client';
import { demoEmail, useTestApp, type SignedInClient, byRole, everyRole } from '../support/test-app';

let tagNumber = 0;

async function query<Row>(text: ReturnType<typeof sql>): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text));
}

/** Active students of a school without an active loan, in id order. */
async function studentsOf(code: string, howMany: number): Promise<number[]> {
  const rows = await query<{
    id: number;
  }>(sql`select s.id from students s join schools sc on sc.id = s.school_id
    where sc.code = ${code} and s.status = 'active' and s.guardian_email is not null
    and not exists (select 1 from loans l where l.student_id = s.id and l.state = 'active')
    order by s.id desc limit ${howMany}`);
  return rows.map((row) => row.id);
}

/** A new available instrument at a school, made through the API. */
async function newInstrument(code: string, instrumentId = 'trombone'): Promise<number> {
  const response = await coordinator.post('/api/instruments', {
    assetTag: `TEST-LOAN-${(tagNumber += 1)}`,
    instrumentId,
    homeSchoolId: app.schoolIds[code],
    condition: 'good',
    purchasedOn: '2024-08-01',
    purchaseCostCents: 120000,
  });
  expect(response.status).toBe(201);
  return response.body.id;
}

function checkout(
  client: SignedInClient,
  instrumentId: number,
  studentId: number,
  extra: object = {},
) {
  return client.post('/api/loans', {
    instrumentId,
    studentId,
    conditionOut: 'good',
    accessories: ['case'],
    usageFeeCents: 4500,
    ...extra,
  });
}

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, technician, viewer, student } = byRole(app.clients);

describe('Loans', () => {
  it('should let exactly one of five concurrent checkouts of one instrument win', async () => {
    const instrumentId = await newInstrument('HPMS');
    const studentIds = await studentsOf('HPMS', 5);
    const responses = await Promise.all(
      studentIds.map((studentId) => checkout(director, instrumentId, studentId)),
    );
    const statuses = responses.map((response) => response.status).sort();
    expect(statuses).toEqual([201, 409, 409, 409, 409]);
    const [{ active }] = await query<{ active: number }>(
      sql`select count(*)::int as active from loans where instrument_id = ${instrumentId} and state = 'active'`,
    );
    expect(active).toBe(1);
  });

  it('should refuse a second checkout and a return of what is not out', async () => {
    const instrumentId = await newInstrument('HPMS');
    const [first, second] = await studentsOf('HPMS', 2);
    const loan = await checkout(director, instrumentId, first!);
    expect(loan.status).toBe(201);
    expect(loanSchema.parse(loan.body).state).toBe('active');
    expect(loan.body.dueOn).toBe('2027-06-11');
    const again = await checkout(director, instrumentId, second!);
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already out on loan/);
    const returned = await director.post(`/api/loans/${loan.body.id}/return`, {
      conditionIn: 'good',
    });
    expect(returned.status).toBe(200);
    expect(returned.body.state).toBe('returned');
    const twice = await director.post(`/api/loans/${loan.body.id}/return`, { conditionIn: 'good' });
    expect(twice.status).toBe(409);
  });

  it('should hold a returned wind instrument in to-clean until it is marked cleaned', async () => {
    const instrumentId = await newInstrument('HPMS', 'trombone');
    const [first, second] = await studentsOf('HPMS', 2);
    const loan = await checkout(director, instrumentId, first!);
    expect(
      (await technician.post(`/api/loans/${loan.body.id}/return`, { conditionIn: 'fair' })).status,
    ).toBe(200);
    const instrument = await coordinator.get(`/api/instruments/${instrumentId}`);
    expect(instrument.body.status).toBe('to-clean');
    expect(instrument.body.condition).toBe('fair');
    expect(instrument.body.cleaningCaution).toMatch(/mouthpieces and reeds are personal/i);
    const blocked = await checkout(director, instrumentId, second!);
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.message).toMatch(/cleaned/);
    const cleaned = await technician.post(`/api/instruments/${instrumentId}/cleaned`, {
      note: 'Bath and sanitiser',
    });
    expect(cleaned.status).toBe(200);
    expect(cleaned.body.status).toBe('available');
    expect((await checkout(director, instrumentId, second!)).status).toBe(201);
    const timeline = (await coordinator.get(`/api/instruments/${instrumentId}`)).body.timeline.map(
      (event: { kind: string }) => event.kind,
    );
    expect(timeline).toEqual(
      expect.arrayContaining(['loan-out', 'return', 'condition-change', 'cleaned']),
    );
  });

  it('should put a string instrument straight back to available, open a repair for damage and mark a lost one missing', async () => {
    const violin = await newInstrument('HPMS', 'violin');
    const tuba = await newInstrument('HPMS', 'tuba');
    const cello = await newInstrument('HPMS', 'cello');
    const [a, b, c] = await studentsOf('HPMS', 3);
    const violinLoan = await checkout(director, violin, a!);
    await director.post(`/api/loans/${violinLoan.body.id}/return`, { conditionIn: 'good' });
    expect((await coordinator.get(`/api/instruments/${violin}`)).body.status).toBe('available');
    const tubaLoan = await checkout(director, tuba, b!);
    expect(tubaLoan.body.cautions.join(' ')).toMatch(/wheeled case/);
    const damaged = await director.post(`/api/loans/${tubaLoan.body.id}/return`, {
      conditionIn: 'poor',
      damaged: { problem: 'Dented bell' },
    });
    expect(damaged.status).toBe(200);
    const tubaNow = await coordinator.get(`/api/instruments/${tuba}`);
    expect(tubaNow.body.status).toBe('in-repair');
    expect(tubaNow.body.openRepairs.map((repair: { problem: string }) => repair.problem)).toEqual([
      'Dented bell',
    ]);
    const celloLoan = await checkout(director, cello, c!);
    const lost = await director.post(`/api/loans/${celloLoan.body.id}/return`, { lost: true });
    expect(lost.body.state).toBe('lost');
    expect((await coordinator.get(`/api/instruments/${cello}`)).body.status).toBe('missing');
    expect((await coordinator.get(`/api/loans/${celloLoan.body.id}`)).status).toBe(200);
  });

  it('should let a director act only for their own schools', async () => {
    const qhmsInstrument = await newInstrument('QHMS');
    const hpmsInstrument = await newInstrument('HPMS');
    const [qhmsStudent] = await studentsOf('QHMS', 1);
    const [hpmsStudent] = await studentsOf('HPMS', 1);
    expect((await checkout(director, hpmsInstrument, qhmsStudent!)).status).toBe(404);
    expect((await checkout(director, qhmsInstrument, hpmsStudent!)).status).toBe(404);
    const qhmsLoan = await checkout(coordinator, qhmsInstrument, qhmsStudent!);
    expect(qhmsLoan.status).toBe(201);
    expect((await director.get(`/api/loans/${qhmsLoan.body.id}`)).status).toBe(404);
    expect(
      (await director.post(`/api/loans/${qhmsLoan.body.id}/return`, { conditionIn: 'good' }))
        .status,
    ).toBe(404);
    const list = listResponseSchema(loanSchema).parse(
      (await director.get('/api/loans?limit=1000')).body,
    );
    expect(list.rows.length).toBeGreaterThan(0);
    expect(new Set(list.rows.map((row) => row.schoolCode))).toEqual(new Set(['HPMS']));
  });

  it('should show waiver reasons to coordinator and director only', async () => {
    const instrumentId = await newInstrument('HPMS');
    const [studentId] = await studentsOf('HPMS', 1);
    const loan = await checkout(director, instrumentId, studentId!, {
      waiver: true,
      waiverReason: 'Free or reduced-price meals',
    });
    expect(loan.body.waiverReason).toBe('Free or reduced-price meals');
    expect(loan.body.usageFeeCents).toBe(0);
    expect((await coordinator.get(`/api/loans/${loan.body.id}`)).body.waiverReason).toBe(
      'Free or reduced-price meals',
    );
    const seenByTechnician = await technician.get(`/api/loans/${loan.body.id}`);
    expect(seenByTechnician.status).toBe(200);
    expect(seenByTechnician.body.waiver).toBe(true);
    expect(seenByTechnician.body).not.toHaveProperty('waiverReason');
    const technicianList = await technician.get('/api/loans?limit=1000');
    expect(JSON.stringify(technicianList.body)).not.toContain('waiverReason');
  });

  it('should show a student only their own loans and a viewer read-only loans of their school', async () => {
    const own = await student.get('/api/loans');
    expect(own.status).toBe(200);
    const [{ studentId }] = await query<{ studentId: number }>(
      sql`select student_id as "studentId" from users where email = ${demoEmail('student.hpms')}`,
    );
    expect(own.body.total).toBeGreaterThanOrEqual(1);
    expect(own.body.rows.every((row: { studentId: number }) => row.studentId === studentId)).toBe(
      true,
    );
    expect(JSON.stringify(own.body)).not.toContain('waiverReason');
    const [other] = await query<{ id: number }>(
      sql`select id from loans where student_id <> ${studentId} order by id limit 1`,
    );
    expect((await student.get(`/api/loans/${other!.id}`)).status).toBe(404);
    expect(
      (await student.post('/api/loans', { instrumentId: 1, studentId, conditionOut: 'good' }))
        .status,
    ).toBe(403);
    const viewed = await viewer.get('/api/loans?limit=1000');
    expect(viewed.status).toBe(200);
    expect(new Set(viewed.body.rows.map((row: { schoolCode: string }) => row.schoolCode))).toEqual(
      new Set(['TRHS']),
    );
    expect(
      (await viewer.post(`/api/loans/${viewed.body.rows[0].id}/return`, { conditionIn: 'good' }))
        .status,
    ).toBe(403);
  });

  it('should filter overdue and unsigned loans', async () => {
    const overdue = await coordinator.get('/api/loans?overdue=true&limit=1000');
    expect(overdue.body.total).toBeGreaterThan(0);
    expect(
      overdue.body.rows.every(
        (row: { overdue: boolean; state: string }) => row.overdue && row.state === 'active',
      ),
    ).toBe(true);
    const unsigned = await coordinator.get('/api/loans?unsigned=true&state=active&limit=1000');
    expect(unsigned.body.total).toBeGreaterThan(0);
    expect(unsigned.body.rows.every((row: { signed: boolean }) => !row.signed)).toBe(true);
  });

  it('should e-mail one guardian a reminder of an overdue loan and refuse one for an ended loan', async () => {
    const overdue = (await director.get('/api/loans?overdue=true&limit=1')).body.rows[0];
    const reminded = await director.post(`/api/loans/${overdue.id}/reminder`);
    expect(reminded.status).toBe(200);
    expect(reminded.body.queued).toBe(1);
    const [message] = await query<{ kind: string; subject: string }>(
      sql`select kind, subject from outbox_messages where related_type = 'loan' and related_id = ${overdue.id} order by id desc limit 1`,
    );
    expect(message).toMatchObject({ kind: 'overdue-reminder' });
    expect(message!.subject).toMatch(/^Overdue/);
    const ended = (await director.get('/api/loans?state=returned&limit=1')).body.rows[0];
    expect((await director.post(`/api/loans/${ended.id}/reminder`)).status).toBe(409);
    expect((await technician.post(`/api/loans/${overdue.id}/reminder`)).status).toBe(403);
  });
});
