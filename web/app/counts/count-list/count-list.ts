import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { Router, RouterLink } from '@angular/router';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { dayText } from '../../instruments/instrument-labels';
import { injectSchoolChoices } from '../../schools/school-choices';
import { namedChoices } from '../../core/grid/filter-select/filter-select';
import { InventoryCounts } from '../count-data';
import { createWrite } from '../../core/state/write';
import { Field } from '../../core/forms/field';

/** The annual count: start one for a school, go back to an open one, see past counts. */
@Component({
  selector: 'tb-count-list',
  imports: [Field, MatButtonModule, MatIconModule, PageState, RouterLink],
  templateUrl: './count-list.html',
  styleUrl: './count-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CountList {
  private readonly write = createWrite();
  private readonly counts = inject(InventoryCounts);
  private readonly router = inject(Router);

  protected readonly schools = injectSchoolChoices();
  protected readonly schoolChoices = computed(() => namedChoices(this.schools()));
  protected readonly list = this.counts.recent(50);
  protected readonly schoolId = signal<number | null>(null);
  protected readonly starting = signal(false);
  protected readonly failure = signal('');
  protected readonly day = dayText;
  protected readonly errorMessage = errorMessage;

  protected start(): void {
    const schoolId =
      this.schoolId() ?? (this.schools().length === 1 ? this.schools()[0]!.id : null);
    if (!schoolId || this.starting()) return;
    this.starting.set(true);
    this.failure.set('');
    this.write.send(this.counts.start(schoolId), {
      next: (count) => void this.router.navigate(['/counts', count.id]),
      error: (error: unknown) => {
        this.starting.set(false);
        this.failure.set(errorMessage(error, 'The count could not be started.'));
      },
    });
  }
}
