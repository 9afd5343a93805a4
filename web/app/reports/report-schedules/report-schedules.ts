import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import type { Observable } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import type { ReportKind, ReportSchedule, ReportScheduleInput } from '@shared/api/report';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { injectSchoolChoices } from '../../schools/school-choices';
import { addressesIn } from '../send-dialog/send-dialog';
import { ReportData } from '../report-data';
import { momentText } from '../report-period';
import { cronFor, describeCron, scheduleDays, scheduleTimeZones } from '../schedule-choices';
import { createWrite } from '../../core/state/write';

/** Who a schedule sends to, as the form offers it. */
type Audience = 'all-directors' | 'school' | 'addresses';

/** The coordinator's report schedules: list, create with simple choices, pause and delete. */
@Component({
  selector: 'tb-report-schedules',
  imports: [
    FormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    PageState,
  ],
  templateUrl: './report-schedules.html',
  styleUrl: './report-schedules.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReportSchedules {
  private readonly write = createWrite();
  private readonly reports = inject(ReportData);

  protected readonly schedules = rxResource({ stream: () => this.reports.schedules() });
  protected readonly schools = injectSchoolChoices();
  protected readonly days = scheduleDays;
  protected readonly timeZones = scheduleTimeZones;

  protected readonly kind = signal<ReportKind>('director');
  protected readonly day = signal<string>('1');
  protected readonly time = signal('07:00');
  protected readonly timeZone = signal<string>('America/Los_Angeles');
  protected readonly periodDays = signal(7);
  protected readonly audience = signal<Audience>('all-directors');
  protected readonly schoolId = signal<number | null>(null);
  protected readonly addressText = signal('');

  protected readonly saving = this.write.saving;
  protected readonly problem = signal<string | null>(null);
  /** The schedule whose delete is waiting for a second click. */
  protected readonly confirmingDelete = signal<number | null>(null);
  protected readonly describeCron = describeCron;
  protected readonly momentText = momentText;

  protected readonly ready = computed(() => {
    if (!/^\d{2}:\d{2}$/.test(this.time())) return false;
    if (this.audience() === 'school') return this.schoolId() !== null;
    if (this.audience() === 'addresses') {
      return (
        addressesIn(this.addressText()).length > 0 &&
        (this.kind() === 'district' || this.schoolId() !== null)
      );
    }
    return true;
  });

  /** The schedule being made, in words. */
  protected readonly summary = computed(() =>
    this.ready()
      ? `${describeCron(cronFor(this.day(), this.time()))}, ${this.timeZone()}.`
      : 'Choose a time and who it goes to.',
  );

  protected setKind(kind: ReportKind): void {
    this.kind.set(kind);
    if (kind === 'district' && this.audience() === 'school') this.audience.set('all-directors');
  }

  /** Who a schedule goes to, in words. */
  protected targetText(schedule: ReportSchedule): string {
    const { schoolIds, recipients } = schedule.target;
    if (recipients?.length) return recipients.join(', ');
    if (schoolIds === 'all-directors') return 'Every director';
    const names = (schoolIds ?? []).map(
      (id) => this.schools().find((school) => school.id === id)?.code ?? `school ${id}`,
    );
    return `Directors of ${names.join(', ')}`;
  }

  protected create(): void {
    if (!this.ready()) return;
    const audience = this.audience();
    const target: ReportScheduleInput['target'] =
      audience === 'school'
        ? { schoolIds: [this.schoolId()!] }
        : audience === 'addresses'
          ? {
              recipients: addressesIn(this.addressText()),
              ...(this.kind() === 'director' ? { schoolIds: [this.schoolId()!] } : {}),
            }
          : { schoolIds: 'all-directors' };
    const input: ReportScheduleInput = {
      kind: this.kind(),
      cron: cronFor(this.day(), this.time()),
      timeZone: this.timeZone(),
      target,
      periodDays: this.periodDays(),
      active: true,
    };
    this.run(this.reports.createSchedule(input));
  }

  protected setActive(schedule: ReportSchedule, active: boolean): void {
    this.run(this.reports.setScheduleActive(schedule, active));
  }

  protected remove(schedule: ReportSchedule): void {
    if (this.confirmingDelete() !== schedule.id) {
      this.confirmingDelete.set(schedule.id);
      return;
    }
    this.confirmingDelete.set(null);
    this.run(this.reports.deleteSchedule(schedule.id));
  }

  private run(request: Observable<unknown>): void {
    this.problem.set(null);
    this.write.send(request, {
      next: () => {
        this.schedules.reload();
      },
      error: (failure: unknown) => {
        this.problem.set(errorMessage(failure, 'The schedule could not be saved. Try again.'));
        this.schedules.reload();
      },
    });
  }
}
