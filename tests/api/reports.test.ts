import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { ladderVersions, passOffs } from '../../server/db/schema/index';
import { drainOutbox } from '../../server/mail/mail-worker';
import { restoreNeutralisedCell } from '@shared/roster/roster-csv';
import { useTestApp } from '../support/test-app';
import { novemberReport, seedTinyDistrict, type TinyDistrict } from './reports-district';

let district: TinyDistrict;

const november = 'from=2026-11-01&to=2026-11-30';
const services = () => ({ db: app.database.db, config: app.config });

const app = useTestApp({
  template: 'empty',
  seed: async (database) => {
    district = await seedTinyDistrict(database.db);
  },
  signIn: ['coordinator', 'director.hpms', 'viewer.trhs', 'student.hpms'],
});
const {
  coordinator,
  'director.hpms': director,
  'viewer.trhs': viewer,
  'student.hpms': student,
} = app.clients;

describe('Director report', () => {
  it('should match the hand-counted figures when the coordinator previews Heron Point for November', async () => {
    const response = await coordinator.get(
      `/api/reports/preview?kind=director&schoolId=${district.schoolIds.HPMS}&${november}`,
    );
    expect(response.status).toBe(200);
    const data = response.body.data;
    // Five active students: Finn Gray is withdrawn and counts nowhere.
    expect(data.enrolment).toEqual({
      students: 5,
      byEnsemble: [
        { label: 'Beginning Band', students: 1 },
        { label: 'Concert Band', students: 4 },
      ],
      byInstrument: [
        { label: 'Trumpet', students: 2 },
        { label: 'Clarinet', students: 1 },
        { label: 'Flute', students: 1 },
        { label: 'Tuba', students: 1 },
      ],
    });
    // Dev Ellis has no attainment row: rung 0. Grade 7's benchmark moved to rung 2 on 15 November.
    expect(data.ladder).toEqual({
      available: true,
      byRung: [
        { rung: 0, students: 1 },
        { rung: 1, students: 2 },
        { rung: 3, students: 1 },
        { rung: 4, students: 1 },
      ],
      byGrade: [
        { grade: 6, students: 1, benchmarkRung: null, atOrAbove: 0, share: null },
        { grade: 7, students: 2, benchmarkRung: 2, atOrAbove: 1, share: 0.5 },
        { grade: 8, students: 2, benchmarkRung: 3, atOrAbove: 1, share: 0.5 },
      ],
      share: 0.5,
    });
    // Four hearings at HPMS in November; the October and December ones and Quarry Hill's are out.
    expect(data.passOffs.heard).toBe(4);
    expect(data.passOffs.passed).toBe(3);
    expect(data.passOffs.students).toBe(3);
    expect(data.passOffs.rows.map((row: { heardOn: string }) => row.heardOn)).toEqual([
      '2026-11-05',
      '2026-11-06',
      '2026-11-10',
      '2026-11-20',
    ]);
    // Ben Cole was last heard on 1 October; Dev Ellis never.
    expect(data.stalled.students.map((row: { name: string }) => row.name)).toEqual([
      'Ben Cole',
      'Dev Ellis',
    ]);
    // Ada Brook is on rung 4 against grade 7's benchmark of 2.
    expect(data.auditionReady.students.map((row: { name: string }) => row.name)).toEqual([
      'Ada Brook',
    ]);
    expect(data.fleet).toMatchObject({
      available: true,
      out: 2,
      overdue: 1,
      inRepair: 1,
      unsigned: 1,
    });
    expect(response.body.html).toContain('Heron Point Middle');
    expect(response.body.html).not.toMatch(/<script/i);
    expect(response.body.text).toContain('4 heard, 3 passed, by 3 students.');
  });

  it('should answer 404 when a director previews another school and 403 for a student', async () => {
    const own = await director.get(
      `/api/reports/preview?kind=director&schoolId=${district.schoolIds.HPMS}&${november}`,
    );
    expect(own.status).toBe(200);
    const other = await director.get(
      `/api/reports/preview?kind=director&schoolId=${district.schoolIds.QHMS}&${november}`,
    );
    expect(other.status).toBe(404);
    expect((await director.get(`/api/reports/preview?kind=district&${november}`)).status).toBe(403);
    expect(
      (
        await student.get(
          `/api/reports/preview?kind=director&schoolId=${district.schoolIds.HPMS}&${november}`,
        )
      ).status,
    ).toBe(403);
    expect(
      (await coordinator.get('/api/reports/preview?kind=director&from=2026-11-01&to=2026-11-30'))
        .status,
    ).toBe(400);
  });

  it('should refuse sending when a viewer, a student or a director beyond their own report asks', async () => {
    const body = novemberReport('director', [district.schoolIds.QHMS]);
    expect((await viewer.post('/api/reports/send', body)).status).toBe(403);
    expect((await student.post('/api/reports/send', body)).status).toBe(403);
    expect((await director.post('/api/reports/send', body)).status).toBe(404);
    const toSomeoneElse = {
      ...body,
      schoolIds: [district.schoolIds.HPMS],
      recipients: ['principal@merrowbasin.example'],
    };
    expect((await director.post('/api/reports/send', toSomeoneElse)).status).toBe(403);
    expect(
      (
        await director.post('/api/reports/send', {
          ...body,
          kind: 'district',
          schoolIds: 'all-directors',
        })
      ).status,
    ).toBe(403);
  });

  it('should mail the report with both parts and attachments that read back to the same rows', async () => {
    const sent = await coordinator.post(
      '/api/reports/send',
      novemberReport('director', [district.schoolIds.HPMS]),
    );
    expect(sent.status).toBe(202);
    expect(sent.body.outboxIds).toHaveLength(1);
    await drainOutbox(services());
    const message = app.mail
      .messages()
      .find(
        (each) =>
          each.subject === 'Heron Point Middle (HPMS): director report, 2026-11-01 to 2026-11-30',
      );
    expect(message).toBeDefined();
    expect(message!.to).toEqual(['director.hpms@merrowbasin.example']);
    expect(message!.text).toContain('Stalled students');
    expect(message!.html).toContain('<table');
    // The heading names the school; the line under it does not say it again.
    const [, heading, subtitle] = /font-size:20px[^>]*>([^<]*)<\/div><div[^>]*>([^<]*)<\/div>/.exec(
      message!.html ?? '',
    )!;
    expect(heading).toBe('Heron Point Middle (HPMS): director report');
    expect(subtitle).toBe('2026-11-01 to 2026-11-30');
    expect(message!.attachments.map((attachment) => attachment.filename)).toEqual([
      'HPMS-enrolment.csv',
      'HPMS-pass-offs.csv',
      'HPMS-stalled.csv',
      'HPMS-audition-ready.csv',
      'HPMS-loans.csv',
      'HPMS-report-2026-11-01-to-2026-11-30.xlsx',
    ]);
    const expectedPassOffs = [
      ['heard_on', 'student_id', 'student', 'requirement', 'tempo', 'passed'],
      ['2026-11-05', '900S5', '=1+1 Fox', 'r1-bb-major', '80', 'yes'],
      ['2026-11-06', '900S5', '=1+1 Fox', 'r1-f-major', '84', 'yes'],
      ['2026-11-10', '900S1', 'Ada Brook', 'r4-e-major', '120', 'yes'],
      ['2026-11-20', '900S3', 'Cara Dunn', 'r4-ab-major', '88', 'no'],
    ];
    const csv = app.mail.attachment(message!.id, 1)!.toString('utf8');
    const parsed = Papa.parse<string[]>(csv.trim(), { skipEmptyLines: true }).data;
    // OWASP "CSV Injection": a cell starting with = is written with a leading single quote.
    expect(parsed[1]![2]).toBe("'=1+1 Fox");
    expect(parsed.map((row) => row.map(restoreNeutralisedCell))).toEqual(expectedPassOffs);

    const workbook = new ExcelJS.Workbook();
    await workbook.xlsx.load(app.mail.attachment(message!.id, 5)! as unknown as ArrayBuffer);
    const sheet = workbook.getWorksheet('HPMS-pass-offs')!;
    const sheetRows: string[][] = [];
    sheet.eachRow((row) => sheetRows.push((row.values as unknown[]).slice(1).map(String)));
    expect(sheetRows).toEqual(expectedPassOffs);
    expect(sheet.getCell('C2').type).toBe(ExcelJS.ValueType.String);

    const runs = await coordinator.get('/api/reports?kind=director');
    expect(runs.body.total).toBe(1);
    expect(runs.body.rows[0]).toMatchObject({
      schoolCode: 'HPMS',
      from: '2026-11-01',
      to: '2026-11-30',
      outboxIds: sent.body.outboxIds,
    });
    expect((await director.get('/api/reports')).body.total).toBe(1);
  });

  it('should send a director their own report only, to themselves', async () => {
    const sent = await director.post(
      '/api/reports/send',
      novemberReport('director', [district.schoolIds.HPMS]),
    );
    expect(sent.status).toBe(202);
    const message = await director.get(`/api/outbox/${sent.body.outboxIds[0]}`);
    expect(message.body.to).toEqual(['director.hpms@merrowbasin.example']);
  });
});

describe('District summary', () => {
  it('should put each school beside the district totals and show the change since the last one', async () => {
    const first = await coordinator.get(`/api/reports/preview?kind=district&${november}`);
    expect(first.status).toBe(200);
    const hpms = first.body.data.schools.find((school: { code: string }) => school.code === 'HPMS');
    const qhms = first.body.data.schools.find((school: { code: string }) => school.code === 'QHMS');
    expect(hpms.figures).toEqual({
      students: 5,
      atOrAboveShare: 0.5,
      passOffsHeard: 4,
      passOffsPassed: 3,
      stalled: 2,
      auditionReady: 1,
      instrumentsOut: 2,
      overdue: 1,
      inRepair: 1,
      unsigned: 1,
    });
    // Gia Hart (grade 7, rung 2) and Hal Ives (grade 8, rung 3) are both at their benchmark.
    expect(qhms.figures).toEqual({
      students: 2,
      atOrAboveShare: 1,
      passOffsHeard: 1,
      passOffsPassed: 1,
      stalled: 1,
      auditionReady: 0,
      instrumentsOut: 1,
      overdue: 0,
      inRepair: 0,
      unsigned: 1,
    });
    // The district share counts students, not schools: (2 + 2) of (4 + 2).
    expect(first.body.data.totals).toEqual({
      students: 7,
      atOrAboveShare: 4 / 6,
      passOffsHeard: 5,
      passOffsPassed: 4,
      stalled: 3,
      auditionReady: 1,
      instrumentsOut: 3,
      overdue: 1,
      inRepair: 1,
      unsigned: 2,
    });
    expect(first.body.data.previous).toBeNull();

    const sent = await coordinator.post(
      '/api/reports/send',
      novemberReport('district', 'all-directors'),
    );
    expect(sent.status).toBe(202);
    // One message for each director of the district.
    expect(sent.body.outboxIds).toHaveLength(2);

    const [ladder] = await app.database.db.select({ id: ladderVersions.id }).from(ladderVersions);
    await app.database.db.insert(passOffs).values({
      studentId: district.studentIds['S4']!,
      schoolId: district.schoolIds.HPMS,
      grade: 8,
      ladderVersionId: ladder!.id,
      requirementCode: 'r1-bb-major',
      heardOn: '2026-11-25',
      tempo: 90,
      passed: true,
    });
    const second = await coordinator.get(`/api/reports/preview?kind=district&${november}`);
    expect(second.body.data.previous.totals.passOffsHeard).toBe(5);
    expect(second.body.data.totals.passOffsHeard).toBe(6);
    expect(second.body.data.totals.stalled).toBe(2);
    expect(second.body.text).toMatch(/Pass-offs heard\s+\+1/);
    expect(second.body.text).toMatch(/Stalled students\s+−1/);
    expect(second.body.html).toContain('Change since');
  });
});

describe('A test send', () => {
  it('should send one report to the sender alone, its subject marked as a test, before it goes to the directors', async () => {
    const before = (await coordinator.get('/api/reports?kind=director')).body.total;
    const sent = await coordinator.post(
      '/api/reports/send',
      novemberReport('director', 'all-directors', { test: true }),
    );
    expect(sent.status).toBe(202);
    expect(sent.body.outboxIds).toHaveLength(1);
    const message = await coordinator.get(`/api/outbox/${sent.body.outboxIds[0]}`);
    expect(message.body.to).toEqual(['coordinator@merrowbasin.example']);
    expect(message.body.subject).toMatch(/^Test: .+: director report, 2026-11-01 to 2026-11-30$/);
    expect((await coordinator.get('/api/reports?kind=director')).body.total).toBe(before + 1);
    // A director's test goes to themselves, as their sends do.
    const own = await director.post(
      '/api/reports/send',
      novemberReport('director', [district.schoolIds.HPMS], { test: true }),
    );
    expect(own.status).toBe(202);
    const ownMessage = await director.get(`/api/outbox/${own.body.outboxIds[0]}`);
    expect(ownMessage.body.to).toEqual(['director.hpms@merrowbasin.example']);
    expect(ownMessage.body.subject).toMatch(/^Test: Heron Point Middle/);
    // Not a boolean: refused, nothing queued.
    const bad = await coordinator.post(
      '/api/reports/send',
      novemberReport('director', 'all-directors', { test: 'yes' }),
    );
    expect(bad.status).toBe(400);
  });
});
