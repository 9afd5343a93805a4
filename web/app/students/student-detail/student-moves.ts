import { WhenPipe } from '../../core/format/formats';
import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  output,
  signal,
} from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatSelectModule } from '@angular/material/select';
import type { SchoolSummary } from '@shared/api/me';
import type { StudentDetail } from '@shared/api/student';
import { isConflict } from '../../core/forms/record-form';
import { errorMessage } from '../../core/parse';
import { StudentData } from './student-data';
import { createWrite } from '../../core/state/write';

/** The student's school, the "Move to another school" action, and the moves so far. */
@Component({
  selector: 'tb-student-moves',
  imports: [WhenPipe, MatButtonModule, MatFormFieldModule, MatIconModule, MatSelectModule],
  template: `
    <section aria-labelledby="school-title">
      <h2 id="school-title">School</h2>
      <p class="current">
        <strong>{{ student().school.name }}</strong> ·
        <span class="tb-muted">{{ student().school.code }}</span>
      </p>
      @if (editable() && otherSchools().length > 0) {
        @if (choosing()) {
          <div class="move">
            <mat-form-field appearance="outline" subscriptSizing="dynamic" class="grow">
              <mat-label>Move to</mat-label>
              <mat-select
                [value]="target()"
                (selectionChange)="target.set($event.value)"
                data-testid="move-target"
              >
                @for (school of otherSchools(); track school.id) {
                  <mat-option [value]="school.id">{{ school.name }}</mat-option>
                }
              </mat-select>
            </mat-form-field>
            <button mat-flat-button type="button" [disabled]="!target() || busy()" (click)="move()">
              Move
            </button>
            <button mat-button type="button" (click)="choosing.set(false)">Cancel</button>
          </div>
          <p class="tb-muted hint">
            Seats in the old school's ensembles end; the record, its pass-offs and its history stay
            with the student.
          </p>
        } @else {
          <button
            mat-stroked-button
            type="button"
            (click)="choosing.set(true)"
            data-testid="move-student"
          >
            Move to another school
          </button>
        }
      }
      @if (message()) {
        <p class="message" role="alert">{{ message() }}</p>
      }
      <h3>School history</h3>
      @if (student().moves.length === 0) {
        <p class="tb-muted">No moves: at {{ student().school.code }} since the record began.</p>
      } @else {
        <ol class="moves" data-testid="student-moves">
          @for (move of student().moves; track move.id) {
            <li>
              <span>{{ move.fromSchool?.code ?? 'New' }} → {{ move.toSchool.code }}</span>
              <span class="tb-muted"
                >{{ move.movedAt | when
                }}{{ move.movedByName ? ' · ' + move.movedByName : '' }}</span
              >
            </li>
          }
        </ol>
      }
    </section>
  `,
  styles: `
    h2 {
      margin: 0 0 8px;
      font-size: 1.05rem;
      font-weight: 600;
    }
    h3 {
      margin: 16px 0 6px;
      font-size: 0.95rem;
      font-weight: 600;
      color: var(--tb-text-muted);
    }
    .current {
      margin: 0 0 12px;
    }
    .move {
      display: flex;
      gap: 8px;
      align-items: center;
      flex-wrap: wrap;
    }
    .grow {
      flex: 1;
      min-width: 180px;
    }
    .hint {
      font-size: 0.85rem;
      margin: 6px 0 0;
    }
    .message {
      color: var(--tb-danger);
    }
    .moves {
      list-style: none;
      margin: 0;
      padding: 0;
    }
    .moves li {
      display: flex;
      justify-content: space-between;
      gap: 8px;
      padding: 6px 0;
      border-bottom: 1px solid var(--tb-line);
    }
    .moves li:last-child {
      border-bottom: 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentMoves {
  private readonly write = createWrite();
  private readonly studentData = inject(StudentData);

  readonly student = input.required<StudentDetail>();
  /** The schools the user works with. */
  readonly schools = input<SchoolSummary[]>([]);
  readonly editable = input(false);
  /** The student moved (or the record changed meanwhile); it should be loaded again. */
  readonly moved = output<void>();

  protected readonly choosing = signal(false);
  protected readonly target = signal<number | null>(null);
  protected readonly busy = signal(false);
  protected readonly message = signal('');
  protected readonly otherSchools = computed(() =>
    this.schools().filter((school) => school.id !== this.student().schoolId),
  );

  protected move(): void {
    const toSchoolId = this.target();
    if (!toSchoolId) return;
    this.busy.set(true);
    this.message.set('');
    const request = this.studentData.move(this.student().id, {
      toSchoolId,
      version: this.student().version,
    });
    this.write.send(request, {
      next: () => {
        this.busy.set(false);
        this.choosing.set(false);
        this.moved.emit();
      },
      error: (error: unknown) => {
        this.busy.set(false);
        if (isConflict(error)) {
          this.message.set(
            'Someone else changed this student meanwhile. The record is loaded again; try the move once more.',
          );
          this.moved.emit();
        } else {
          this.message.set(errorMessage(error));
        }
      },
    });
  }
}
