import {
  studentCell,
  tableOf,
  type RowCell,
  type RowTable,
} from '../../core/charts/rows-table/row-cells';
import type { DrillRows } from '../overview-data';
import { gradeLabel, rungLabel } from '../overview-charts/figure-words';

const statusWords: Partial<Record<string, string>> = {
  active: 'Plays',
  withdrawn: 'Stopped',
  graduated: 'Graduated',
  leaving: 'Left the district',
};

function assetTagCell(row: { assetTag: string }): RowCell {
  return { text: row.assetTag, heads: true, cellClass: 'tb-asset-tag' };
}

/** The table for each list the Overview drills into. */
export function drillTable(rows: DrillRows): RowTable {
  switch (rows.path) {
    case '/api/analytics/students':
      return tableOf(
        ['Student', 'School', 'Grade', 'Rung', 'Benchmark', 'Last passed'],
        rows.list.rows,
        (student) => [
          studentCell(student),
          { text: student.schoolCode },
          { text: gradeLabel(student.grade) },
          { text: rungLabel(student.rung) },
          { text: student.benchmarkRung === null ? '—' : `rung ${student.benchmarkRung}` },
          { text: student.lastPassedOn ?? 'never' },
        ],
      );
    case '/api/pass-offs':
      return tableOf(
        ['Heard on', 'Student', 'Requirement', 'Tempo', 'Result'],
        rows.list.rows,
        (passOff) => [
          { text: passOff.heardOn },
          { text: passOff.studentName, link: ['/students', passOff.studentId], heads: true },
          { text: passOff.requirementCode },
          { text: `♩ = ${passOff.tempo}` },
          { text: passOff.passed ? 'Passed' : 'Not yet' },
        ],
      );
    case '/api/instruments':
      return tableOf(
        ['Asset tag', 'Instrument', 'Home school', 'Condition'],
        rows.list.rows,
        (instrument) => [
          assetTagCell(instrument),
          { text: instrument.instrumentName },
          { text: instrument.homeSchoolCode },
          { text: instrument.condition, cellClass: 'capital' },
        ],
      );
    case '/api/loans':
      return tableOf(
        ['Asset tag', 'Instrument', 'Student', 'School', 'Due'],
        rows.list.rows,
        (loan) => [
          assetTagCell(loan),
          { text: loan.instrumentName },
          { text: loan.studentName, link: ['/students', loan.studentId] },
          { text: loan.schoolCode },
          { text: loan.dueOn },
        ],
      );
    case '/api/analytics/retention/students':
      return tableOf(['Student', 'Last year', 'Now', 'Status'], rows.list.rows, (student) => [
        studentCell(student),
        { text: `${student.lastSchoolCode} · ${gradeLabel(student.lastGrade)}` },
        { text: `${student.schoolCode} · ${gradeLabel(student.grade)}` },
        { text: statusWords[student.status] ?? student.status },
      ]);
  }
}
