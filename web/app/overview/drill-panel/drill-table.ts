import type { DrillRows } from '../overview-data';
import { gradeLabel, rungLabel } from '../overview-charts/figure-words';

/** One cell of a drill table: its text, and where it links to when it names a student. */
export interface DrillCell {
  text: string;
  /** Router link commands, when the cell links to a record. */
  link?: (string | number)[];
  /** Whether the cell heads its row (`<th scope="row">`). */
  heads?: boolean;
  /** An extra class for the cell (asset tags, capitalised words). */
  cellClass?: string;
}

/** The rows behind a figure as a table: column headings, then one line of cells per row. */
export interface DrillTable {
  headings: string[];
  lines: { id: number; cells: DrillCell[] }[];
}

const statusWords: Partial<Record<string, string>> = {
  active: 'Plays',
  withdrawn: 'Stopped',
  graduated: 'Graduated',
  leaving: 'Left the district',
};

/** A student's name, last name first, heading its row and linking to the student. */
function studentCell(student: { id: number; lastName: string; firstName: string }): DrillCell {
  return {
    text: `${student.lastName}, ${student.firstName}`,
    link: ['/students', student.id],
    heads: true,
  };
}

function assetTagCell(row: { assetTag: string }): DrillCell {
  return { text: row.assetTag, heads: true, cellClass: 'tb-asset-tag' };
}

/** A table of the given headings with one line of cells per row. */
function tableOf<Row extends { id: number }>(
  headings: string[],
  rows: Row[],
  cells: (row: Row) => DrillCell[],
): DrillTable {
  return { headings, lines: rows.map((row) => ({ id: row.id, cells: cells(row) })) };
}

/** The table for each list the Overview drills into. */
export function drillTable(rows: DrillRows): DrillTable {
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
