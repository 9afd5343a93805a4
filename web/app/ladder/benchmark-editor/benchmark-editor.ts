import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { gradeText } from '../date-text';
import { warningText, type BenchmarkGrid, type FieldErrors } from '../ladder-editor/draft-model';
import { Field } from '../../core/forms/field';
import { IconButton } from '../../core/icon-button/icon-button';

const allGrades = Array.from({ length: 13 }, (_unused, grade) => grade);

/** Edits the benchmarks: the dates they fall on, and for each grade the rung due by each date. */
@Component({
  selector: 'tb-benchmark-editor',
  imports: [Field, IconButton, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule],
  templateUrl: './benchmark-editor.html',
  styleUrl: './benchmark-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class BenchmarkEditor {
  readonly grid = input.required<BenchmarkGrid>();
  readonly rungCount = input.required<number>();
  readonly errors = input.required<FieldErrors>();
  readonly gridChange = output<BenchmarkGrid>();

  protected readonly gradeText = gradeText;
  protected readonly warningText = warningText;
  protected readonly rungChoices = computed(() =>
    Array.from({ length: this.rungCount() + 1 }, (_unused, rung) => ({
      value: rung,
      label: rung === 0 ? 'Not started' : `Rung ${rung}`,
    })),
  );
  /** The grades not in the table yet, to add one. */
  protected readonly gradeChoices = computed(() => {
    const present = new Set(this.grid().rows.map((row) => row.grade));
    return allGrades
      .filter((grade) => !present.has(grade))
      .map((grade) => ({ value: grade, label: `Grade ${gradeText(grade)}` }));
  });

  protected error(row: number, column: number): string {
    return this.errors().get(`benchmark.${row}.${column}`) ?? '';
  }

  protected setCheckpoint(column: number, event: Event): void {
    const byDate = (event.target as HTMLInputElement).value;
    const grid = this.grid();
    this.gridChange.emit({
      ...grid,
      checkpoints: grid.checkpoints.map((date, index) => (index === column ? byDate : date)),
    });
  }

  protected addCheckpoint(): void {
    const grid = this.grid();
    this.gridChange.emit({
      checkpoints: [...grid.checkpoints, ''],
      rows: grid.rows.map((row) => ({ ...row, rungs: [...row.rungs, null] })),
    });
  }

  protected removeCheckpoint(column: number): void {
    const grid = this.grid();
    this.gridChange.emit({
      checkpoints: grid.checkpoints.filter((_date, index) => index !== column),
      rows: grid.rows.map((row) => ({
        ...row,
        rungs: row.rungs.filter((_rung, index) => index !== column),
      })),
    });
  }

  protected setRung(rowIndex: number, column: number, rung: number | null): void {
    const grid = this.grid();
    this.gridChange.emit({
      ...grid,
      rows: grid.rows.map((row, index) =>
        index === rowIndex
          ? { ...row, rungs: row.rungs.map((value, at) => (at === column ? rung : value)) }
          : row,
      ),
    });
  }

  /** Adds the grade chosen in "Add a grade" (null when the choice is cleared: nothing to add). */
  protected addGrade(grade: number | null): void {
    if (grade === null) return;
    const grid = this.grid();
    const rows = [...grid.rows, { grade, rungs: grid.checkpoints.map(() => null) }].sort(
      (a, b) => a.grade - b.grade,
    );
    this.gridChange.emit({ ...grid, rows });
  }

  protected removeGrade(rowIndex: number): void {
    const grid = this.grid();
    this.gridChange.emit({ ...grid, rows: grid.rows.filter((_row, index) => index !== rowIndex) });
  }
}
