import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  output,
  signal,
} from '@angular/core';
import { DecimalPipe } from '@angular/common';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatIconModule } from '@angular/material/icon';
import type { SchoolYear, YearStartResult } from '@shared/api/school-year';
import { Field } from '../../core/forms/field';
import { errorMessage } from '../../core/parse';
import { SchoolYearData, type YearStartRequest } from '../school-year-data';
import { createWrite } from '../../core/state/write';

/** The year after one named like "2026-27" (or "2026–27"), or '' when the name is not like that. */
export function followingYearName(name: string): string {
  const match = /^(\d{4})([-–])(\d{2}|\d{4})$/.exec(name);
  if (!match) return '';
  const first = Number(match[1]) + 1;
  const second =
    match[3]!.length === 2 ? String((first + 1) % 100).padStart(2, '0') : String(first + 1);
  return `${first}${match[2]}${second}`;
}

/** A day 52 weeks later: the same weekday the next year, as school calendars run. */
export function sameWeekdayNextYear(day: string): string {
  const date = new Date(`${day}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() + 364);
  return date.toISOString().slice(0, 10);
}

/**
 * Starts the next school year: its name and dates, a preview of every count school by school
 * with the students it cannot place and the loans due back, a backup offered, then one step.
 */
@Component({
  selector: 'tb-year-start',
  imports: [DecimalPipe, Field, FormsModule, MatButtonModule, MatCheckboxModule, MatIconModule],
  templateUrl: './year-start.html',
  styleUrl: './year-start.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class YearStart {
  private readonly write = createWrite();
  private readonly data = inject(SchoolYearData);

  /** The year the district works in now. */
  readonly current = input.required<SchoolYear>();
  /** Every year, to suggest the next one's dates after the latest. */
  readonly years = input.required<SchoolYear[]>();
  /** Emitted once a new year has started. */
  readonly started = output<YearStartResult>();

  protected readonly name = linkedSignal(() => followingYearName(this.current().name));
  protected readonly startsOn = linkedSignal(() => sameWeekdayNextYear(this.current().startsOn));
  protected readonly endsOn = linkedSignal(() => sameWeekdayNextYear(this.current().endsOn));
  protected readonly emptyEnsembles = signal(false);
  protected readonly preview = signal<YearStartResult | null>(null);
  protected readonly result = signal<YearStartResult | null>(null);
  protected readonly busy = signal(false);
  protected readonly confirming = signal(false);
  protected readonly failure = signal('');
  protected readonly schoolsWithStudents = computed(
    () =>
      this.preview()?.schools.filter((school) => school.students > 0 || school.ensembles > 0) ?? [],
  );

  private request(): YearStartRequest {
    return {
      name: this.name().trim(),
      startsOn: this.startsOn(),
      endsOn: this.endsOn(),
      emptyEnsembles: this.emptyEnsembles(),
    };
  }

  /** Any change to the form makes the preview out of date. */
  protected edited(): void {
    this.preview.set(null);
    this.confirming.set(false);
  }

  protected takePreview(): void {
    if (this.busy()) return;
    this.busy.set(true);
    this.failure.set('');
    this.result.set(null);
    this.write.send(this.data.preview(this.request()), {
      next: (preview) => {
        this.busy.set(false);
        this.preview.set(preview);
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.preview.set(null);
        this.failure.set(errorMessage(error, 'The preview could not be made.'));
      },
    });
  }

  protected start(): void {
    const preview = this.preview();
    if (!preview || this.busy()) return;
    this.busy.set(true);
    this.failure.set('');
    this.write.send(this.data.start({ ...this.request(), basis: preview.basis }), {
      next: (result) => {
        this.busy.set(false);
        this.confirming.set(false);
        this.preview.set(null);
        this.result.set(result);
        this.started.emit(result);
      },
      error: (error: unknown) => {
        this.busy.set(false);
        this.confirming.set(false);
        this.preview.set(null);
        this.failure.set(
          errorMessage(error, 'The year could not be started. Nothing was changed.'),
        );
      },
    });
  }
}
