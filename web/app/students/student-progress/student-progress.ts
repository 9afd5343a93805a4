import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { HttpErrorResponse } from '@angular/common/http';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { StudentProgress as Progress } from '@shared/api/analytics';
import type { LadderRequirement } from '@shared/api/ladder';
import type { PassOff } from '@shared/api/pass-off';
import { instrumentById } from '@shared/music';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { LoadFailed } from '../../core/state/load-failed';
import { PageState } from '../../core/state/page-state';
import { dateText, gradeText } from '../../ladder/date-text';
import { LadderData } from '../../ladder/ladder-data';
import {
  articulationText,
  keyText,
  patternText,
  practiceQuery,
  requirementsByCode,
  rungTitleText,
  tempoText,
} from '../../ladder/requirement-text';
import { recordingUrl } from '../../pass-offs/pass-off-data';
import { StudentProgressData } from './student-progress-data';

/** The instrument practice links are written for when the student has none on record. */
const fallbackInstrument = 'clarinet';

/**
 * A student's page: their rung on the ladder in force, what comes next with its practice
 * sheets, and every pass-off with its recording. Students see only their own.
 */
@Component({
  selector: 'tb-student-progress',
  imports: [MatButtonModule, MatIconModule, RouterLink, LoadFailed, PageState],
  templateUrl: './student-progress.html',
  styleUrl: './student-progress.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentProgress {
  private readonly progressData = inject(StudentProgressData);
  private readonly ladderData = inject(LadderData);
  private readonly currentUser = inject(CurrentUser);

  /** The route's `:id`: the student's id. */
  readonly id = input.required<string>();

  private readonly studentId = computed(() => {
    const id = Number(this.id());
    return Number.isInteger(id) && id > 0 ? id : undefined;
  });
  private readonly progressRef = this.progressData.progress(this.studentId);
  private readonly inForce = this.ladderData.inForce();
  protected readonly progress = computed<Progress | null>(() =>
    this.progressRef.hasValue() ? this.progressRef.value() : null,
  );
  protected readonly ladder = computed(() =>
    this.inForce.hasValue() ? this.inForce.value() : null,
  );
  /** The first failure of the two reads, if any. */
  private readonly error = computed(() => this.progressRef.error() ?? this.inForce.error());
  /** Which of the page's states to show: a student outside the caller's reach is "missing". */
  protected readonly state = computed(() => {
    if (this.studentId() === undefined) return 'missing';
    const error = this.error();
    if (error) {
      const status = error instanceof HttpErrorResponse ? error.status : 0;
      return status === 404 || status === 403 ? 'missing' : 'error';
    }
    return this.progress() && this.ladder() ? 'ready' : 'loading';
  });
  protected readonly failure = computed(() =>
    errorMessage(this.error(), 'The progress page could not be loaded.'),
  );
  protected readonly isStudent = this.currentUser.me()?.role === 'student';
  protected readonly canSeeRecord = this.currentUser.can('roster:read');
  protected readonly canEnter = this.currentUser.can('pass-offs:write');

  protected readonly instrumentId = computed(
    () => this.progress()?.instrumentId ?? fallbackInstrument,
  );
  protected readonly instrumentName = computed(() => {
    const id = this.progress()?.instrumentId;
    return id ? instrumentById(id).name : null;
  });
  protected readonly byCode = computed(() => requirementsByCode(this.ladder()?.rungs ?? []));
  protected readonly segments = computed(() => {
    const progress = this.progress();
    if (!progress) return [];
    return (this.ladder()?.rungs ?? []).map((rung) => ({
      number: rung.number,
      title: rungTitleText(rung),
      reached: rung.number <= progress.rung,
      next: rung.number === progress.next.rung,
    }));
  });
  protected readonly heading = computed(() => {
    const progress = this.progress();
    if (!progress) return '';
    if (progress.rung === 0) return `Not on a rung yet — ${progress.rungCount} rungs to climb`;
    const title = progress.rungTitle
      ? rungTitleText({ number: progress.rung, title: progress.rungTitle })
      : '';
    return `Rung ${progress.rung} of ${progress.rungCount}${title ? ` — ${title}` : ''}`;
  });
  protected readonly notesById = computed(
    () => new Map((this.progress()?.notes ?? []).map((note) => [note.passOffId, note.message])),
  );

  protected readonly keyText = keyText;
  protected readonly patternText = patternText;
  protected readonly articulationText = articulationText;
  protected readonly tempoText = tempoText;
  protected readonly dateText = dateText;
  protected readonly gradeText = gradeText;
  protected readonly rungTitleText = rungTitleText;
  protected readonly recordingUrl = recordingUrl;

  protected practiceLink(requirement: LadderRequirement): Record<string, string> {
    return {
      ...practiceQuery(requirement, this.instrumentId()),
      requirementCode: requirement.code,
    };
  }

  protected scaleText(passOff: PassOff): string {
    const found = this.byCode().get(passOff.requirementCode);
    return found
      ? `Rung ${found.rung} · ${keyText(found.requirement)}`
      : `${passOff.requirementCode} (no longer on the ladder)`;
  }

  protected recordingLabel(passOffId: number): string {
    const passOff = this.progress()?.history.find((each) => each.id === passOffId);
    return passOff ? `${this.scaleText(passOff)}, ${dateText(passOff.heardOn)}` : 'Recording';
  }

  protected fetch(): void {
    this.progressRef.reload();
    this.inForce.reload();
  }
}
