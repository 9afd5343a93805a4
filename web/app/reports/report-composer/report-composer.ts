import '../../core/screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  signal,
} from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { RouterLink } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatDialog } from '@angular/material/dialog';
import { dialogAnswer } from '../../core/confirm-dialog/dialog-answer';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatTabsModule } from '@angular/material/tabs';
import type { ReportKind, ReportSendInput } from '@shared/api/report';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { PageState } from '../../core/state/page-state';
import { codedSchoolChoices, injectSchoolChoices } from '../../schools/school-choices';
import { Field } from '../../core/forms/field';
import { MailFrame } from '../mail-frame/mail-frame';
import { ReportData, type PreviewRequest } from '../report-data';
import { lastDays } from '../report-period';
import { SendDialog, type SendDialogData } from '../send-dialog/send-dialog';
import type { SchoolYear } from '@shared/api/school-year';
import { YearPicker } from '../../school-years/year-picker/year-picker';
import { createWrite } from '../../core/state/write';

const isoDate = /^\d{4}-\d{2}-\d{2}$/;

/** Choose a report and its period, read the preview as the mail will look, and send it. */
@Component({
  selector: 'tb-report-composer',
  imports: [
    Field,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatIconModule,
    MatProgressBarModule,
    MatTabsModule,
    MailFrame,
    PageState,
    YearPicker,
  ],
  templateUrl: './report-composer.html',
  styleUrl: './report-composer.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReportComposer {
  private readonly write = createWrite();
  private readonly reports = inject(ReportData);
  private readonly dialog = inject(MatDialog);
  private readonly currentUser = inject(CurrentUser);

  protected readonly me = this.currentUser.me;
  /** Whether the district summary is offered (the coordinator's report). */
  protected readonly offersDistrict = computed(() => this.me()?.role === 'coordinator');
  /** Whether the user may send at all: the coordinator, or a director to themselves. */
  protected readonly sends = computed(() =>
    ['coordinator', 'director'].includes(this.me()?.role ?? ''),
  );

  protected readonly kind = signal<ReportKind>('director');
  protected readonly schoolId = signal<number | null>(null);
  protected readonly from = signal(lastDays(7).from);
  protected readonly to = signal(lastDays(7).to);
  /** A past year chosen in the year picker: its whole period, read and not sent. */
  protected readonly pastYear = signal<SchoolYear | null>(null);

  protected readonly schools = injectSchoolChoices();
  protected readonly schoolChoices = computed(() => codedSchoolChoices(this.schools()));
  protected readonly school = computed(
    () => this.schools().find((row) => row.id === this.schoolId()) ?? null,
  );
  protected readonly periodProblem = computed(() => {
    if (!isoDate.test(this.from()) || !isoDate.test(this.to())) return 'Choose both dates.';
    return this.from() > this.to() ? 'The period ends before it starts.' : null;
  });
  protected readonly request = computed<PreviewRequest | undefined>(() => {
    if (this.periodProblem()) return undefined;
    if (this.kind() === 'director' && this.schoolId() === null) return undefined;
    return { kind: this.kind(), schoolId: this.schoolId(), from: this.from(), to: this.to() };
  });
  protected readonly preview = rxResource({
    params: () => this.request(),
    stream: ({ params }) => this.reports.preview(params),
  });

  protected readonly previewProblem = computed(() =>
    errorMessage(
      this.preview.error(),
      'The server did not answer. Check your connection and try again.',
    ),
  );

  protected readonly sending = signal(false);
  /** What the last send queued; `test` holds the address a test went to. */
  protected readonly sent = signal<{ messages: number; test?: string } | null>(null);
  protected readonly sendError = signal<string | null>(null);

  constructor() {
    // Start on the user's first school once the list arrives.
    effect(() => {
      const first = this.schools()[0];
      if (first && this.schoolId() === null) this.schoolId.set(first.id);
    });
  }

  protected setKind(kind: ReportKind): void {
    this.kind.set(kind);
    this.sent.set(null);
  }

  /** A past year reads that whole year; back to the current year, the last seven days. */
  protected chooseYear(year: SchoolYear | null): void {
    this.pastYear.set(year);
    const period = year ? { from: year.startsOn, to: year.endsOn } : lastDays(7);
    this.from.set(period.from);
    this.to.set(period.to);
    this.sent.set(null);
  }

  protected async openSend(): Promise<void> {
    const me = this.me();
    if (!me) return;
    const school = this.school();
    const data: SendDialogData = {
      kind: this.kind(),
      school: school ? { id: school.id, name: school.name } : null,
      from: this.from(),
      to: this.to(),
      choosesRecipients: me.role === 'coordinator',
      ownEmail: me.email,
    };
    const input = await dialogAnswer<ReportSendInput>(this.dialog, SendDialog, {
      data,
      width: '520px',
      autoFocus: 'first-tabbable',
    });
    if (input) this.send(input);
  }

  /** Sends this report once, to the signed-in user alone, before it goes to directors. */
  protected sendTest(): void {
    const me = this.me();
    if (!me || !this.preview.value()) return;
    const input: ReportSendInput = {
      kind: this.kind(),
      from: this.from(),
      to: this.to(),
      test: true,
    };
    const schoolId = this.schoolId();
    if (this.kind() === 'director' && schoolId !== null) input.schoolIds = [schoolId];
    else input.recipients = [me.email];
    this.send(input, me.email);
  }

  private send(input: ReportSendInput, testTo?: string): void {
    this.sending.set(true);
    this.sent.set(null);
    this.sendError.set(null);
    this.write.send(this.reports.send(input), {
      next: (result) => {
        this.sending.set(false);
        this.sent.set({ messages: result.outboxIds.length, test: testTo });
      },
      error: (failure: unknown) => {
        this.sending.set(false);
        this.sendError.set(errorMessage(failure, 'The report could not be queued. Try again.'));
      },
    });
  }
}
