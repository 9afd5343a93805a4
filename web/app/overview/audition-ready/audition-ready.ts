import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import type { AuditionReadyRow } from '@shared/api/analytics';
import type { LadderRequirement } from '@shared/api/ladder';
import type { ListResponse } from '@shared/api/list';
import { RowsTable } from '../../core/charts/rows-table/rows-table';
import { studentCell, tableOf } from '../../core/charts/rows-table/row-cells';
import { errorMessage } from '../../core/parse';
import { OverviewData, type OverviewFilters } from '../overview-data';
import { gradeLabel, rungLabel } from '../overview-charts/figure-words';

/** A requirement as a director reads it: "r3-bb-major · B♭ major, ♩ = 100". */
export function requirementLabel(requirement: LadderRequirement): string {
  const tonic = requirement.tonic
    .replace(/(?<=^[A-G])bb$/, '𝄫')
    .replace(/(?<=^[A-G])b$/, '♭')
    .replace(/##$/, '𝄪')
    .replace(/#$/, '♯');
  return `${requirement.code} · ${tonic} ${requirement.mode.replaceAll('-', ' ')}, ♩ = ${requirement.tempo}`;
}

/** The best tempo heard per requirement, in the order of the requirement codes: "r3-bb-major ♩ = 104". */
function tempoParts(tempos: Record<string, number>): string[] {
  return Object.entries(tempos)
    .sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    .map(([key, value]) => `${key} ♩ = ${value}`);
}

/**
 * Who is ready for an audition: the students who passed every chosen requirement, at the
 * requirement's own tempo or at a minimum tempo the coordinator sets.
 */
@Component({
  selector: 'tb-audition-ready',
  imports: [
    FormsModule,
    RowsTable,
    MatButtonModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatProgressBarModule,
  ],
  templateUrl: './audition-ready.html',
  styleUrl: './audition-ready.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuditionReady {
  private readonly data = inject(OverviewData);
  readonly filters = input<OverviewFilters>({});

  protected readonly ladder = rxResource({ stream: () => this.data.ladder() });
  protected readonly rungs = computed(() => this.ladder.value()?.rungs ?? []);
  protected readonly chosen = signal<string[]>([]);
  protected readonly minTempo = signal<number | null>(null);
  /** The search the user last ran; undefined before the first. */
  private readonly asked = signal<
    { codes: string[]; tempo: number | null; filters: OverviewFilters } | undefined
  >(undefined);
  private readonly answer = rxResource({
    params: () => this.asked(),
    stream: ({ params }) => this.data.auditionReady(params.codes, params.tempo, params.filters),
  });
  protected readonly result = computed<ListResponse<AuditionReadyRow> | null>(() =>
    this.answer.hasValue() ? this.answer.value() : null,
  );
  protected readonly searching = this.answer.isLoading;
  protected readonly error = computed(() =>
    this.answer.error()
      ? errorMessage(this.answer.error(), 'The list could not be loaded. Try again.')
      : null,
  );
  /** The ready students as a table, each with the best tempo heard per requirement. */
  protected readonly table = computed(() => {
    const list = this.result();
    return list
      ? tableOf(['Student', 'School', 'Grade', 'Rung', 'Best tempos'], list.rows, (student) => [
          studentCell(student),
          { text: student.schoolCode },
          { text: gradeLabel(student.grade) },
          { text: rungLabel(student.rung) },
          { text: '', parts: tempoParts(student.bestTempos) },
        ])
      : null;
  });
  protected readonly requirementLabel = requirementLabel;

  protected find(): void {
    if (this.chosen().length === 0) return;
    const tempo = this.minTempo();
    // A new request object each time, so the same search can be run again.
    this.asked.set({
      codes: this.chosen(),
      tempo: typeof tempo === 'number' && tempo > 0 ? tempo : null,
      filters: this.filters(),
    });
  }
}
