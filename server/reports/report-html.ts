import type { DirectorReportData, DistrictReportData } from '@shared/api/report';
import { barTable, dataTable, figureBoxes, heading, mailDocument, note } from './report-html-parts';
import {
  countChange,
  countText,
  figureRows,
  figureText,
  loanFlags,
  gradeLabel,
  percent,
  shareChange,
} from './report-format';

function unavailable(section: { available: false; reason: string }): string {
  return note(section.reason);
}

function studentTable(students: DirectorReportData['stalled']): string {
  if (!students.available) return unavailable(students);
  if (students.students.length === 0) return note(`${students.rule} Nobody at the moment.`);
  return (
    note(students.rule) +
    dataTable(
      ['Student', 'Grade', 'Rung', 'Benchmark', 'Last pass-off'],
      students.students.map((student) => [
        student.name,
        gradeLabel(student.grade),
        student.rung,
        student.benchmarkRung ?? '–',
        student.lastPassOffOn ?? 'never',
      ]),
      [2, 3],
    )
  );
}

/** The rung parts of a director report: students by rung and the benchmark share by grade. */
function ladderParts(ladder: DirectorReportData['ladder']): string[] {
  if (ladder.available)
    return [
      barTable(
        ladder.byRung.map((row) => ({
          label: row.rung === 0 ? 'Not started' : `Rung ${row.rung}`,
          value: row.students,
        })),
      ),
      heading('At or above benchmark, by grade'),
      barTable(
        ladder.byGrade.map((row) => ({
          label: `${gradeLabel(row.grade)} (benchmark ${row.benchmarkRung ?? 'none'})`,
          value: row.share ?? 0,
          display: row.share === null ? '–' : `${percent(row.share)} of ${row.students}`,
        })),
        1,
      ),
    ];
  return [unavailable(ladder), heading('At or above benchmark, by grade'), unavailable(ladder)];
}

/** The instrument parts of a director report: the fleet's figures and the loans to follow up. */
function fleetParts(fleet: DirectorReportData['fleet']): string[] {
  const parts: string[] = [];
  if (fleet.available) {
    parts.push(
      dataTable(
        ['Out on loan', 'Overdue', 'In repair', 'Unsigned agreements'],
        [[fleet.out, fleet.overdue, fleet.inRepair, fleet.unsigned]],
        [0, 1, 2, 3],
      ),
    );
    const attention = fleet.loans.filter((loan) => loan.overdue || !loan.signed);
    if (attention.length) {
      parts.push(
        heading('Loans to follow up'),
        dataTable(
          ['Asset tag', 'Instrument', 'Student', 'Due', 'Overdue', 'Agreement'],
          attention.map((loan) => [
            loan.assetTag,
            loan.instrument,
            loan.student,
            loan.dueOn,
            ...loanFlags(loan),
          ]),
        ),
      );
    }
  } else {
    parts.push(unavailable(fleet));
  }
  return parts;
}

/** The HTML part of a director report. */
export function directorReportHtml(data: DirectorReportData, district = ''): string {
  const { enrolment, ladder, passOffs, fleet } = data;
  const parts = [
    figureBoxes([
      { label: 'Students', value: String(enrolment.students) },
      { label: 'At or above benchmark', value: ladder.available ? percent(ladder.share) : '–' },
      { label: 'Pass-offs passed', value: passOffs.available ? String(passOffs.passed) : '–' },
      { label: 'Loans overdue', value: fleet.available ? String(fleet.overdue) : '–' },
    ]),
    heading('Enrolment by ensemble'),
    enrolment.byEnsemble.length
      ? barTable(enrolment.byEnsemble.map((row) => ({ label: row.label, value: row.students })))
      : note('No ensembles yet.'),
    heading('Enrolment by instrument'),
    enrolment.byInstrument.length
      ? barTable(enrolment.byInstrument.map((row) => ({ label: row.label, value: row.students })))
      : note('No seats this school year yet.'),
    heading('Students by rung'),
  ];
  parts.push(...ladderParts(ladder));
  parts.push(heading('Pass-offs in the period'));
  parts.push(
    passOffs.available
      ? note(
          `${passOffs.heard} heard, ${passOffs.passed} passed, by ${passOffs.students} students. Every hearing is in the attached files.`,
        )
      : unavailable(passOffs),
  );
  parts.push(heading('Stalled students'), studentTable(data.stalled));
  parts.push(heading('Audition-ready students'), studentTable(data.auditionReady));
  parts.push(heading('Instruments'));
  parts.push(...fleetParts(fleet));
  // The heading names the school once; the line under it only adds the period.
  return mailDocument(
    `${data.school.name} (${data.school.code}): director report`,
    `${data.from} to ${data.to}`,
    parts.join('\n'),
    district,
  );
}

/** The HTML part of the district summary. */
export function districtReportHtml(data: DistrictReportData, district = ''): string {
  const header = ['', ...data.schools.map((school) => school.code), 'District'];
  if (data.previous) header.push(`Change since ${data.previous.sentAt.slice(0, 10)}`);
  const rows = figureRows.map(({ field, label, share }) => {
    const row = [
      label,
      ...data.schools.map((school) => figureText(school.figures, field)),
      figureText(data.totals, field),
    ];
    if (data.previous) {
      const before = data.previous.totals[field];
      row.push(
        share ? shareChange(data.totals[field], before) : countChange(data.totals[field], before),
      );
    }
    return row;
  });
  const numeric = header.map((_label, index) => index).slice(1);
  const parts = [
    figureBoxes([
      { label: 'Students', value: countText(data.totals.students) },
      { label: 'At or above benchmark', value: percent(data.totals.atOrAboveShare) },
      { label: 'Pass-offs passed', value: countText(data.totals.passOffsPassed) },
      { label: 'Loans overdue', value: countText(data.totals.overdue) },
    ]),
    heading('Schools side by side'),
    dataTable(header, rows, numeric),
    data.previous
      ? note(
          `Changes compare with the summary sent for ${data.previous.from} to ${data.previous.to}.`,
        )
      : note('This is the first district summary: there is nothing to compare with yet.'),
    heading('At or above benchmark, by school'),
    barTable(
      data.schools.map((school) => ({
        label: school.code,
        value: school.figures.atOrAboveShare ?? 0,
        display: percent(school.figures.atOrAboveShare),
      })),
      1,
    ),
  ];
  return mailDocument(
    'District summary',
    `Every school, ${data.from} to ${data.to}`,
    parts.join('\n'),
    district,
  );
}
