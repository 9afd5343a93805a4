/** One cell of a table of rows: its text, and where it links to when it names a record. */
export interface RowCell {
  text: string;
  /** Router link commands, when the cell links to a record. */
  link?: (string | number)[];
  /** Whether the cell heads its row (`<th scope="row">`). */
  heads?: boolean;
  /** An extra class for the cell: `tb-asset-tag`, or `capital` for words that come in lower case. */
  cellClass?: string;
  /** Short parts shown side by side instead of the text (a student's tempos). */
  parts?: string[];
}

/** The rows behind a figure as a table: column headings, then one line of cells per row. */
export interface RowTable {
  headings: string[];
  lines: { id: number; cells: RowCell[] }[];
}

/** A table of the given headings with one line of cells per row. */
export function tableOf<Row extends { id: number }>(
  headings: string[],
  rows: Row[],
  cells: (row: Row) => RowCell[],
): RowTable {
  return { headings, lines: rows.map((row) => ({ id: row.id, cells: cells(row) })) };
}

/** A student's name, last name first, heading its row and linking to the student. */
export function studentCell(student: { id: number; lastName: string; firstName: string }): RowCell {
  return {
    text: `${student.lastName}, ${student.firstName}`,
    link: ['/students', student.id],
    heads: true,
  };
}
