import {
  ChangeDetectionStrategy,
  Component,
  computed,
  effect,
  inject,
  input,
  linkedSignal,
  output,
  signal,
  untracked,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { RouterLink } from '@angular/router';
import type { LadderRung } from '@shared/api/ladder';
import { recordingContentTypes, recordingSizeLimit, type PassOff } from '@shared/api/pass-off';
import { errorMessage } from '../../core/parse';
import { dateText } from '../../ladder/date-text';
import { keyText, requirementsByCode, tempoText } from '../../ladder/requirement-text';
import { PassOffData, recordingUrl } from '../pass-off-data';
import { createWrite } from '../../core/state/write';
import { IconButton } from '../../core/icon-button/icon-button';

/** The recording limits as a sentence, from the shared limits the server enforces. */
export const recordingLimitsText = `Audio up to ${recordingSizeLimit / (1024 * 1024)} MB: WebM, Ogg, MP3, WAVE or MP4 (M4A). The server checks the file itself, not only its name.`;

/** One student's pass-offs, newest first, with recordings to play and to attach. */
@Component({
  selector: 'tb-student-history',
  imports: [IconButton, MatButtonModule, MatIconModule, MatProgressBarModule, RouterLink],
  templateUrl: './student-history.html',
  styleUrl: './student-history.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentHistory {
  private readonly write = createWrite();
  private readonly passOffData = inject(PassOffData);

  readonly studentId = input.required<number>();
  readonly studentName = input('');
  readonly rungs = input<readonly LadderRung[]>([]);
  readonly canWrite = input(false);
  /** Changes whenever new pass-offs of the student were saved, so the list reloads. */
  readonly reloadToken = input(0);
  readonly closed = output<void>();

  private readonly history = this.passOffData.ofStudent(this.studentId);
  /** The student's pass-offs as read, with the recordings attached since. */
  protected readonly passOffs = linkedSignal<PassOff[] | null>(() =>
    this.history.hasValue() ? this.history.value().rows : null,
  );
  protected readonly loadError = computed(() =>
    this.history.error()
      ? errorMessage(this.history.error(), 'The history could not be loaded.')
      : '',
  );
  protected readonly uploading = signal<number | null>(null);
  protected readonly uploadMessages = signal<ReadonlyMap<number, string>>(new Map());
  protected readonly byCode = computed(() => requirementsByCode(this.rungs()));
  protected readonly limitsText = recordingLimitsText;
  protected readonly accept = recordingContentTypes.join(',');
  protected readonly recordingUrl = recordingUrl;
  protected readonly dateText = dateText;
  protected readonly tempoText = tempoText;

  constructor() {
    // The first run reads the token the page opened with; each change after it reads again.
    let first = true;
    effect(() => {
      this.reloadToken();
      if (first) {
        first = false;
        return;
      }
      untracked(() => this.history.reload());
    });
  }

  protected scaleText(passOff: PassOff): string {
    const found = this.byCode().get(passOff.requirementCode);
    return found ? `Rung ${found.rung} · ${keyText(found.requirement)}` : passOff.requirementCode;
  }

  protected chooseFile(input: HTMLInputElement): void {
    input.value = '';
    input.click();
  }

  protected attach(passOff: PassOff, event: Event): void {
    const file = (event.target as HTMLInputElement).files?.[0];
    if (!file) return;
    if (file.size > recordingSizeLimit) {
      this.setMessage(
        passOff.id,
        `That file is ${(file.size / (1024 * 1024)).toFixed(1)} MB; a recording may be at most 10 MB.`,
      );
      return;
    }
    this.uploading.set(passOff.id);
    this.setMessage(passOff.id, '');
    this.write.send(this.passOffData.attachRecording(passOff.id, file), {
      next: (recording) => {
        this.uploading.set(null);
        this.passOffs.update(
          (rows) =>
            rows?.map((row) => (row.id === passOff.id ? { ...row, recording } : row)) ?? rows,
        );
        this.setMessage(passOff.id, 'Recording attached.');
      },
      error: (error: unknown) => {
        this.uploading.set(null);
        this.setMessage(passOff.id, errorMessage(error, 'The recording could not be attached.'));
      },
    });
  }

  private setMessage(id: number, message: string): void {
    this.uploadMessages.update((messages) => new Map(messages).set(id, message));
  }
}
