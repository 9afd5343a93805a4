import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { dayText } from '../../instruments/instrument-labels';
import { injectSchoolChoices } from '../../schools/school-choices';
import { InventoryCounts } from '../count-data';
import { createWrite } from '../../core/state/write';

/** The annual count: start one for a school, go back to an open one, see past counts. */
@Component({
  selector: 'tb-count-list',
  imports: [
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatSelectModule,
    PageState,
    RouterLink,
  ],
  templateUrl: './count-list.html',
  styleUrl: './count-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CountList {
  private readonly write = createWrite();
  private readonly counts = inject(InventoryCounts);
  private readonly router = inject(Router);

  protected readonly schools = injectSchoolChoices();
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
