import type { ColDef, ICellRendererParams } from 'ag-grid-community';
import type { LadderRequirement } from '@shared/api/ladder';
import { keyText, requirementSummary, familiesText } from '../ladder/requirement-text';
import { cellHtml, type CellView } from './entry-cells';
import { escapeHtml } from '@shared/html/escape-html';

/** One student's row of the entry grid. */
export interface EntryRow {
  studentId: number;
  name: string;
  grade: string;
  instrumentName: string;
  /** The instrument's family, or null when the student has no instrument on record. */
  family: string | null;
  /** The rung on the ladder in force; null when it is not known. */
  rung: number | null;
  /** Whether the rungs are still loading. */
  rungLoading: boolean;
}

/** The column id of the student column (clicking a student opens their history). */
export const studentColumn = 'student';

/**
 * The entry grid's columns: the student, instrument and rung pinned on the left, then one
 * column for each requirement of the rung, whose cells the `view` function describes.
 */
export function entryColumns(
  requirements: readonly LadderRequirement[],
  view: (row: EntryRow, requirement: LadderRequirement) => CellView,
): ColDef<EntryRow>[] {
  return [
    {
      colId: studentColumn,
      headerName: 'Student',
      pinned: 'left',
      width: 168,
      valueGetter: (params) => params.data?.name ?? '',
      cellRenderer: (params: ICellRendererParams<EntryRow>) =>
        params.data
          ? `<span class="student"><span class="student-name">${escapeHtml(params.data.name)}</span><span class="student-grade">Grade ${escapeHtml(params.data.grade)}</span></span>`
          : '',
      cellClass: 'student-cell',
    },
    {
      colId: 'instrument',
      headerName: 'Instrument',
      pinned: 'left',
      width: 104,
      valueGetter: (params) => params.data?.instrumentName || '—',
    },
    {
      colId: 'rung',
      headerName: 'Rung',
      pinned: 'left',
      width: 60,
      valueGetter: (params) =>
        params.data?.rungLoading ? '…' : (params.data?.rung ?? '—').toString(),
      cellClass: 'rung-cell',
    },
    ...requirements.map((requirement): ColDef<EntryRow> => ({
      colId: requirement.code,
      headerName: `${keyText(requirement)} ♩${requirement.tempo}${requirement.optional ? ' (optional)' : ''}`,
      headerClass: requirement.optional ? 'optional-requirement' : undefined,
      wrapHeaderText: true,
      autoHeaderHeight: true,
      headerTooltip: `${requirementSummary(requirement)} · ${familiesText(requirement)}${requirement.optional ? ' · optional' : ''}`,
      flex: 1,
      minWidth: 124,
      valueGetter: (params) => (params.data ? view(params.data, requirement) : null),
      cellRenderer: (params: ICellRendererParams<EntryRow, CellView & { takeSent?: boolean }>) =>
        params.value ? cellHtml(params.value, requirement, params.value.takeSent) : '',
      cellClass: 'pass-off-cell',
    })),
  ];
}
