import '../../core/screen-kit';
import { HttpErrorResponse } from '@angular/common/http';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  linkedSignal,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router, RouterLink } from '@angular/router';
import type { LadderRequirement, LadderVersionSummary } from '@shared/api/ladder';
import { instrumentById } from '@shared/music';
import { reachWarnings } from '../reach-warnings';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { LoadFailed } from '../../core/state/load-failed';
import { PageState } from '../../core/state/page-state';
import { createWrite } from '../../core/state/write';
import { StudentProgressData } from '../../students/student-progress/student-progress-data';
import { benchmarkTable } from '../benchmark-table';
import { dateText, gradeText } from '../date-text';
import { InstrumentPicker } from '../instrument-picker/instrument-picker';
import { injectPutInForce } from '../impact-dialog/impact-dialog';
import { LadderData } from '../ladder-data';
import {
  appliesToFamily,
  articulationText,
  familiesText,
  keyText,
  patternText,
  practiceQuery,
  rungTitleText,
  tempoText,
} from '../requirement-text';

/** The instrument staff see practice-sheet links for until they pick another. */
const defaultInstrument = 'clarinet';

/**
 * The scale ladder in force: its rungs and their requirements, each linked to its practice
 * sheet for the reader's instrument, and the benchmarks by grade. The coordinator starts or
 * continues a draft from here.
 */
@Component({
  selector: 'tb-ladder-view',
  imports: [
    MatButtonModule,
    MatCheckboxModule,
    MatIconModule,
    RouterLink,
    LoadFailed,
    PageState,
    InstrumentPicker,
  ],
  templateUrl: './ladder-view.html',
  styleUrl: './ladder-view.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class LadderView {
  private readonly ladderData = inject(LadderData);
  private readonly progressData = inject(StudentProgressData);
  private readonly currentUser = inject(CurrentUser);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);
  private readonly putInForce = injectPutInForce();

  protected readonly canEdit = this.currentUser.can('ladder:write');
  protected readonly isStudent = this.currentUser.me()?.role === 'student';
  protected readonly studentId = this.currentUser.me()?.studentId ?? null;
  /** The ladder in force, as read from the API. */
  protected readonly inForce = this.ladderData.inForce();
  protected readonly ladder = computed(() =>
    this.inForce.hasValue() ? this.inForce.value() : null,
  );
  /** Whether no ladder is in force yet (the API answers 404). */
  protected readonly missing = computed(() => {
    const error = this.inForce.error();
    return error instanceof HttpErrorResponse && error.status === 404;
  });
  protected readonly errorMessage = errorMessage;
  private readonly progressRef = this.progressData.progress(() =>
    this.isStudent && this.studentId ? this.studentId : undefined,
  );
  protected readonly progress = computed(() =>
    this.progressRef.hasValue() ? this.progressRef.value() : null,
  );
  private readonly versions = this.ladderData.versionList(() => this.canEdit);
  protected readonly drafts = computed(() =>
    this.versions.hasValue()
      ? this.versions.value().filter((version) => version.status === 'draft')
      : [],
  );
  /** The version in force before this one, which a roll-back puts back. */
  protected readonly previous = computed<LadderVersionSummary | null>(() => {
    if (!this.versions.hasValue()) return null;
    return (
      this.versions
        .value()
        .filter((version) => version.status === 'archived' && version.publishedAt)
        .sort((first, second) => second.publishedAt!.localeCompare(first.publishedAt!))[0] ?? null
    );
  });
  /** The student's own instrument once their progress is read, until they pick another. */
  protected readonly instrumentId = linkedSignal(
    () => this.progress()?.instrumentId ?? defaultInstrument,
  );
  protected readonly onlyMine = signal(true);
  private readonly draftWrite = createWrite();
  protected readonly startingDraft = this.draftWrite.saving;

  protected readonly instrument = computed(() => instrumentById(this.instrumentId()));
  protected readonly met = computed(() => new Set(this.progress()?.metRequirementCodes ?? []));
  protected readonly benchmarks = computed(() => benchmarkTable(this.ladder()?.benchmarks ?? []));
  /** Per requirement code: why the picked instrument cannot play it at the grades it targets. */
  protected readonly outOfReach = computed(() => {
    const ladder = this.ladder();
    const instrument = this.instrument();
    const messages = new Map<string, string>();
    if (!ladder) return messages;
    const rungs = ladder.rungs.map((rung) => ({
      ...rung,
      requirements: rung.requirements.filter((requirement) =>
        appliesToFamily(requirement, instrument.family),
      ),
    }));
    for (const warning of reachWarnings(rungs, ladder.benchmarks)) {
      const line = warning.details.find((detail) => detail.startsWith(`${instrument.name}:`));
      if (line) messages.set(warning.code, line.slice(instrument.name.length + 2));
    }
    return messages;
  });
  protected readonly rungs = computed(() => {
    const family = this.instrument().family;
    return (this.ladder()?.rungs ?? []).map((rung) => ({
      ...rung,
      heading: rungTitleText(rung),
      shown: rung.requirements.filter(
        (requirement) => !this.onlyMine() || appliesToFamily(requirement, family),
      ),
      hidden: rung.requirements.filter((requirement) => !appliesToFamily(requirement, family))
        .length,
    }));
  });

  protected readonly keyText = keyText;
  protected readonly patternText = patternText;
  protected readonly articulationText = articulationText;
  protected readonly tempoText = tempoText;
  protected readonly familiesText = familiesText;
  protected readonly dateText = dateText;
  protected readonly gradeText = gradeText;

  protected practiceLink(requirement: LadderRequirement): Record<string, string> {
    return practiceQuery(requirement, this.instrumentId());
  }

  protected appliesToMe(requirement: LadderRequirement): boolean {
    return appliesToFamily(requirement, this.instrument().family);
  }

  protected startDraft(starter = false): void {
    this.draftWrite.send(this.ladderData.createDraft(undefined, starter), {
      next: (draft) => void this.router.navigate(['/ladder/versions', draft.id, 'edit']),
      error: (error: unknown) =>
        this.snackBar.open(errorMessage(error, 'The draft could not be started.'), 'Close'),
    });
  }

  protected async rollBack(): Promise<void> {
    const previous = this.previous();
    if (!previous) return;
    const data = { versionId: previous.id, mode: 'restore' as const, name: previous.name };
    if (await this.putInForce(data)) this.fetch();
  }

  protected fetch(): void {
    this.inForce.reload();
    this.progressRef.reload();
    this.versions.reload();
  }
}
