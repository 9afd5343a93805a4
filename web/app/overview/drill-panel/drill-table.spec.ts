import { describe, expect, it } from 'vitest';
import { attainmentRowSchema } from '@shared/api/analytics';
import { retentionStudentSchema } from '@shared/api/year-over-year';
import { drillTable } from './drill-table';

const student = attainmentRowSchema.parse({
  id: 41,
  studentNumber: 'MB-0041',
  firstName: 'Ada',
  lastName: 'Quill',
  grade: 6,
  schoolId: 3,
  schoolCode: 'FHM',
  rung: 0,
  metCount: 0,
  lastPassedOn: null,
  lastPassOffOn: null,
  benchmarkRung: null,
});

describe('drillTable', () => {
  it('should give each student one cell per heading, the name heading the row and linking to the student', () => {
    const table = drillTable({
      path: '/api/analytics/students',
      list: { total: 2, rows: [student, { ...student, id: 42, rung: 3, benchmarkRung: 2 }] },
    });
    expect(table.headings).toEqual([
      'Student',
      'School',
      'Grade',
      'Rung',
      'Benchmark',
      'Last passed',
    ]);
    expect(table.lines.map((line) => line.id)).toEqual([41, 42]);
    for (const line of table.lines) expect(line.cells).toHaveLength(table.headings.length);
    expect(table.lines[0]?.cells).toEqual([
      { text: 'Quill, Ada', link: ['/students', 41], heads: true },
      { text: 'FHM' },
      { text: 'Grade 6' },
      { text: 'None yet' },
      { text: '—' },
      { text: 'never' },
    ]);
    expect(table.lines[1]?.cells.slice(3, 5).map((cell) => cell.text)).toEqual([
      'Rung 3',
      'rung 2',
    ]);
  });

  it('should read a retention status in words and keep an unknown status as it came', () => {
    const stopped = retentionStudentSchema.parse({
      id: 7,
      studentNumber: 'MB-0007',
      firstName: 'Lior',
      lastName: 'Vance',
      lastSchoolCode: 'FHM',
      lastGrade: 0,
      schoolCode: 'OVH',
      grade: 1,
      status: 'withdrawn',
      continued: false,
    });
    const table = drillTable({
      path: '/api/analytics/retention/students',
      list: { total: 2, rows: [stopped, { ...stopped, id: 8, status: 'paused' }] },
    });
    expect(table.lines[0]?.cells.map((cell) => cell.text)).toEqual([
      'Vance, Lior',
      'FHM · Kindergarten',
      'OVH · Grade 1',
      'Stopped',
    ]);
    expect(table.lines[1]?.cells[3]?.text).toBe('paused');
  });
});
