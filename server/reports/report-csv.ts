import { csvField } from '@shared/roster/roster-csv';
import type { DirectorReportData, DistrictReportData, ReportData } from '@shared/api/report';
import { figureRows, loanFlags } from './report-format';

/** A table of detail rows, first row the column names. */
export interface ReportCsvFile {
  /** File name without extension, such as `HPMS-pass-offs`. */
  name: string;
  rows: (string | number)[][];
}

function studentRows(list: DirectorReportData['stalled']): (string | number)[][] {
  const header = [
    'student_id',
    'student',
    'grade',
    'rung',
    'benchmark_rung',
    'last_passed_on',
    'last_pass_off_on',
  ];
  if (!list.available) return [header];
  return [
    header,
    ...list.students.map((student) => [
      student.studentNumber,
      student.name,
      student.grade,
      student.rung,
      student.benchmarkRung ?? '',
      student.lastPassedOn ?? '',
      student.lastPassOffOn ?? '',
    ]),
  ];
}

function directorFiles(data: DirectorReportData): ReportCsvFile[] {
  const code = data.school.code;
  const files: ReportCsvFile[] = [
    {
      name: `${code}-enrolment`,
      rows: [
        ['grouping', 'name', 'students'],
        ...data.enrolment.byEnsemble.map((row) => ['ensemble', row.label, row.students]),
        ...data.enrolment.byInstrument.map((row) => ['instrument', row.label, row.students]),
      ],
    },
  ];
  if (data.passOffs.available) {
    files.push({
      name: `${code}-pass-offs`,
      rows: [
        ['heard_on', 'student_id', 'student', 'requirement', 'tempo', 'passed'],
        ...data.passOffs.rows.map((row) => [
          row.heardOn,
          row.studentNumber,
          row.name,
          row.requirementCode,
          row.tempo,
          row.passed ? 'yes' : 'no',
        ]),
      ],
    });
  }
  if (data.stalled.available)
    files.push({ name: `${code}-stalled`, rows: studentRows(data.stalled) });
  if (data.auditionReady.available) {
    files.push({ name: `${code}-audition-ready`, rows: studentRows(data.auditionReady) });
  }
  if (data.fleet.available) {
    files.push({
      name: `${code}-loans`,
      rows: [
        [
          'asset_tag',
          'instrument',
          'student_id',
          'student',
          'checked_out_on',
          'due_on',
          'overdue',
          'agreement',
        ],
        ...data.fleet.loans.map((loan) => [
          loan.assetTag,
          loan.instrument,
          loan.studentNumber,
          loan.student,
          loan.checkedOutOn,
          loan.dueOn,
          ...loanFlags(loan),
        ]),
      ],
    });
  }
  return files;
}

function districtFiles(data: DistrictReportData): ReportCsvFile[] {
  const rows: (string | number)[][] = [
    [
      'figure',
      ...data.schools.map((school) => school.code),
      'district',
      ...(data.previous ? ['previous_district'] : []),
    ],
  ];
  for (const { field, label } of figureRows) {
    const value = (figures: DistrictReportData['totals']) => figures[field] ?? '';
    rows.push([
      label,
      ...data.schools.map((school) => value(school.figures)),
      value(data.totals),
      ...(data.previous ? [value(data.previous.totals)] : []),
    ]);
  }
  return [{ name: 'district-summary', rows }];
}

/** The report's detail rows, one table per file. */
export function csvFilesOf(data: ReportData): ReportCsvFile[] {
  return data.kind === 'director' ? directorFiles(data) : districtFiles(data);
}

/**
 * A table as CSV text: RFC 4180 quoting, CRLF line breaks, and every cell neutralised against
 * spreadsheet formulas (OWASP "CSV Injection").
 */
export function toCsv(rows: (string | number)[][]): string {
  return `${rows.map((row) => row.map((cell) => csvField(String(cell))).join(',')).join('\r\n')}\r\n`;
}
