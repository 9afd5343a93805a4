import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { NgTemplateOutlet } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { SchoolYear } from '@shared/api/school-year';
import { Field } from '../../core/forms/field';
import { errorMessage } from '../../core/parse';
import { LoadFailed } from '../../core/state/load-failed';
import { SchoolYearData } from '../school-year-data';
import { YearStart } from '../year-start/year-start';
import { createWrite } from '../../core/state/write';

/** A year being added or edited in the table. */
interface YearDraft {
  id: number | null;
  version: number;
  name: string;
  startsOn: string;
  endsOn: string;
}

/**
 * The coordinator's School years screen: every year with its dates and which one is current,
 * a way to add or correct one, and the start of the next year (preview, then one step).
 */
@Component({
  selector: 'tb-school-years-page',
  imports: [NgTemplateOutlet, Field, MatButtonModule, MatIconModule, LoadFailed, YearStart],
  templateUrl: './school-years-page.html',
  styleUrl: './school-years-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SchoolYearsPage {
  private readonly write = createWrite();
  private readonly data = inject(SchoolYearData);

  protected readonly years = rxResource({ stream: () => this.data.list() });
  protected readonly current = computed(() =>
    this.years.value()?.rows.find((year) => year.current),
  );
  protected readonly draft = signal<YearDraft | null>(null);
  protected readonly saving = this.write.saving;
  protected readonly notice = signal('');
  protected readonly failure = signal('');

  protected add(): void {
    this.failure.set('');
    this.draft.set({ id: null, version: 0, name: '', startsOn: '', endsOn: '' });
  }

  protected edit(year: SchoolYear): void {
    this.failure.set('');
    this.draft.set({
      id: year.id,
      version: year.version,
      name: year.name,
      startsOn: year.startsOn,
      endsOn: year.endsOn,
    });
  }

  protected cancel(): void {
    this.draft.set(null);
  }

  protected change(field: 'name' | 'startsOn' | 'endsOn', value: string | null): void {
    this.draft.update((draft) => (draft ? { ...draft, [field]: value ?? '' } : draft));
  }

  protected save(): void {
    const draft = this.draft();
    if (!draft || this.saving()) return;
    this.failure.set('');
    const { name, startsOn, endsOn } = draft;
    const request =
      draft.id === null
        ? this.data.create({ name, startsOn, endsOn })
        : this.data.update(draft.id, { name, startsOn, endsOn, version: draft.version });
    this.write.send(request, {
      next: (year) => {
        this.draft.set(null);
        this.notice.set(`${year.name} is saved.`);
        this.years.reload();
      },
      error: (error: unknown) => {
        this.failure.set(errorMessage(error, 'The year could not be saved.'));
      },
    });
  }

  protected started(): void {
    this.notice.set('');
    this.years.reload();
  }

  protected statusOf(year: SchoolYear): string {
    if (year.current) return 'Current';
    return year.past ? 'History (read-only)' : 'Not started';
  }
}
