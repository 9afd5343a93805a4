import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { passOffBatchResultSchema, passOffSchema, type PassOff } from '@shared/api/pass-off';
import { ensembleDetailSchema } from '@shared/api/ensemble';
import { listResponseSchema } from '@shared/api/list';
import { passOffsByCell } from '../../web/app/pass-offs/pass-off-entry/entry-sheet';
import { cellKey, standingPassOff } from '../../web/app/pass-offs/entry-cells';
import { demoEmail, startTestApp, type SignedInClient, type TestApp } from '../support/test-app';

let app: TestApp;
/** One director signed in on two devices: a phone and a tablet, each with its own session. */
let phone: SignedInClient;
let tablet: SignedInClient;
let ensembleId: number;
let seated: { studentId: number; enrollmentId: number; name: string }[];

const today = new Date().toISOString().slice(0, 10);
const passOffList = listResponseSchema(passOffSchema);

const entry = (studentId: number, extra: Record<string, unknown> = {}) => ({
  studentId,
  requirementCode: 'r2-bb-major',
  heardOn: today,
  tempo: 60,
  passed: false,
  note: '',
  ensembleId,
  clientKey: randomUUID(),
  ...extra,
});

async function historyOf(studentId: number): Promise<PassOff[]> {
  const response = await phone.get(`/api/pass-offs?studentId=${studentId}&limit=1000`);
  expect(response.status).toBe(200);
  return passOffList.parse(response.body).rows;
}

beforeAll(async () => {
  app = await startTestApp();
  [phone, tablet] = await Promise.all([
    app.signIn(demoEmail('director.hpms')),
    app.signIn(demoEmail('director.hpms')),
  ]);
  const ensembles = await phone.get('/api/ensembles?limit=100&sort=name:asc');
  const withMembers = ensembles.body.rows.find(
    (row: { memberCount: number }) => row.memberCount >= 3,
  );
  ensembleId = withMembers.id;
  const detail = ensembleDetailSchema.parse((await phone.get(`/api/ensembles/${ensembleId}`)).body);
  seated = detail.members
    .filter((member) => member.active)
    .slice(0, 3)
    .map((member) => ({
      studentId: member.studentId,
      enrollmentId: member.enrollmentId,
      name: `${member.preferredName ?? member.firstName} ${member.lastName}`,
    }));
  expect(seated).toHaveLength(3);
});
afterAll(() => app?.close());

describe('Pass-offs entered offline', () => {
  it('should keep both entries of one cell made on two devices, and show the later entered one whichever arrived first', async () => {
    const student = seated[0]!;
    const entered = Date.now() - 10 * 60 * 1000;
    // The tablet heard the scale first, the phone a minute later; the phone found the network first.
    const onTablet = entry(student.studentId, {
      tempo: 58,
      enteredAt: new Date(entered).toISOString(),
    });
    const onPhone = entry(student.studentId, {
      tempo: 64,
      enteredAt: new Date(entered + 60_000).toISOString(),
    });
    const fromPhone = await phone.post('/api/pass-offs', { passOffs: [onPhone] });
    const fromTablet = await tablet.post('/api/pass-offs', { passOffs: [onTablet] });
    expect([fromPhone.status, fromTablet.status]).toEqual([201, 201]);
    expect(passOffBatchResultSchema.parse(fromTablet.body).created).toBe(1);

    const history = (await historyOf(student.studentId)).filter(
      (passOff) => passOff.requirementCode === 'r2-bb-major' && passOff.heardOn === today,
    );
    expect(history.map((passOff) => passOff.clientKey).sort()).toEqual(
      [onPhone.clientKey, onTablet.clientKey].sort(),
    );
    const shown = standingPassOff(
      passOffsByCell(history).get(cellKey(student.studentId, 'r2-bb-major')) ?? [],
    );
    expect(shown?.clientKey).toBe(onPhone.clientKey);
    expect(shown?.tempo).toBe(64);

    // Each device sends its queue again after a dropped answer: nothing is recorded twice.
    const again = await tablet.post('/api/pass-offs', { passOffs: [onTablet, onPhone] });
    expect(again.status).toBe(200);
    expect(again.body).toMatchObject({ created: 0, repeated: 2 });
    expect(
      (await historyOf(student.studentId)).filter(
        (passOff) => passOff.requirementCode === 'r2-bb-major' && passOff.heardOn === today,
      ),
    ).toHaveLength(2);
  });

  it('should take a time entered ahead of the server’s clock as the time it arrived', async () => {
    const student = seated[1]!;
    const before = Date.now();
    const response = await phone.post('/api/pass-offs', {
      passOffs: [entry(student.studentId, { enteredAt: '2099-01-01T00:00:00Z' })],
    });
    expect(response.status).toBe(201);
    const [row] = passOffBatchResultSchema.parse(response.body).rows;
    expect(Date.parse(row!.enteredAt)).toBeGreaterThanOrEqual(before - 1000);
    expect(Date.parse(row!.enteredAt)).toBeLessThanOrEqual(Date.now() + 1000);
  });

  it('should refuse, with the reason on that entry, a pass-off for a student who left the ensemble while it waited, recording nothing of the batch', async () => {
    const [stays, leaves] = [seated[1]!, seated[2]!];
    const left = await phone.delete(`/api/enrollments/${leaves.enrollmentId}`);
    expect([200, 204]).toContain(left.status);
    const staysBefore = (await historyOf(stays.studentId)).length;
    const leavesBefore = (await historyOf(leaves.studentId)).length;

    const refused = await tablet.post('/api/pass-offs', {
      passOffs: [entry(stays.studentId), entry(leaves.studentId, { passed: true, tempo: 80 })],
    });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fieldErrors).toEqual([
      {
        field: 'passOffs.1.ensembleId',
        message: `${leaves.name} no longer has a seat in this ensemble, so the pass-off was not recorded.`,
      },
    ]);
    expect((await historyOf(stays.studentId)).length).toBe(staysBefore);
    expect((await historyOf(leaves.studentId)).length).toBe(leavesBefore);

    // The queue sends the rest again without the refused one: that one is recorded.
    const rest = await tablet.post('/api/pass-offs', { passOffs: [entry(stays.studentId)] });
    expect(rest.status).toBe(201);
    expect((await historyOf(stays.studentId)).length).toBe(staysBefore + 1);
    // Sent from a student's page (no ensemble named), a pass-off for them is still recorded.
    const { ensembleId: _ignored, ...withoutEnsemble } = entry(leaves.studentId);
    expect((await tablet.post('/api/pass-offs', { passOffs: [withoutEnsemble] })).status).toBe(201);
  });
});
