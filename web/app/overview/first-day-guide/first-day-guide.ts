import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { forkJoin, map } from 'rxjs';
import * as z from 'zod';
import { parsedWith } from '../../core/parse';

const totalOnly = z.object({ total: z.number().int() });

/** One step of the first day, with whether it is done. */
interface FirstDayStep {
  id: 'schools' | 'ladder' | 'people';
  title: string;
  detail: string;
  done: boolean;
  actions: { label: string; link: string }[];
}

/**
 * The coordinator's first-day guide on the Overview while the district is still empty: the
 * schools (by hand or from a roster), the scale ladder, and the people who sign in, each with
 * its state. It disappears once all three are done.
 */
@Component({
  selector: 'tb-first-day-guide',
  imports: [MatButtonModule, MatIconModule, RouterLink],
  template: `
    @if (steps(); as steps) {
      @if (remaining() > 0) {
        <section
          class="tb-card guide"
          aria-labelledby="first-day-title"
          data-testid="first-day-guide"
        >
          <h2 id="first-day-title">Getting the district started</h2>
          <p class="tb-muted">
            Three steps make Tuttiboard useful; {{ remaining() }} of them
            {{ remaining() === 1 ? 'is' : 'are' }} left. This guide goes away once they are done.
          </p>
          <ol>
            @for (step of steps; track step.id) {
              <li [class.done]="step.done" [attr.data-step]="step.id">
                <mat-icon
                  [svgIcon]="step.done ? 'check_circle' : 'radio_button_unchecked'"
                  [attr.aria-label]="step.done ? 'Done' : 'To do'"
                />
                <div class="text">
                  <strong>{{ step.title }}</strong>
                  <span class="tb-muted">{{ step.detail }}</span>
                  @if (!step.done) {
                    <span class="actions">
                      @for (action of step.actions; track action.link) {
                        <a mat-stroked-button [routerLink]="action.link">{{ action.label }}</a>
                      }
                    </span>
                  }
                </div>
              </li>
            }
          </ol>
        </section>
      }
    }
  `,
  styles: `
    .guide {
      margin-bottom: 20px;
      border-left: 4px solid var(--tb-teal-deep);
    }
    h2 {
      margin: 0 0 4px;
      font-size: 1.15rem;
    }
    ol {
      list-style: none;
      margin: 12px 0 0;
      padding: 0;
      display: grid;
      gap: 12px;
    }
    li {
      display: flex;
      gap: 12px;
      align-items: flex-start;
      mat-icon {
        flex: none;
        color: var(--tb-text-muted);
      }
      &.done mat-icon {
        color: var(--tb-teal-deep);
      }
      &.done strong {
        text-decoration: line-through;
        color: var(--tb-text-muted);
      }
    }
    .text {
      display: flex;
      flex-direction: column;
      gap: 2px;
    }
    .actions {
      display: flex;
      gap: 8px;
      flex-wrap: wrap;
      margin-top: 6px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FirstDayGuide {
  private readonly http = inject(HttpClient);

  private readonly counts = rxResource({
    stream: () => {
      const total = (path: string) =>
        this.http.get(path, { params: { limit: 1 } }).pipe(
          parsedWith(totalOnly),
          map((answer) => answer.total),
        );
      return forkJoin({
        schools: total('/api/schools'),
        ladders: total('/api/ladder/versions'),
        people: total('/api/users'),
      });
    },
  });

  protected readonly steps = computed<FirstDayStep[] | null>(() => {
    const counts = this.counts.value();
    if (!counts) return null;
    return [
      {
        id: 'schools',
        title: 'Add the schools, or import a roster',
        detail: counts.schools
          ? `${counts.schools} ${counts.schools === 1 ? 'school' : 'schools'} so far.`
          : 'Add each school by hand (code, grades served, where its students move up to), or import a roster file from the student information system.',
        done: counts.schools > 0,
        actions: [
          { label: 'Add a school', link: '/schools/new' },
          { label: 'Import a roster', link: '/imports' },
        ],
      },
      {
        id: 'ladder',
        title: 'Set up the scale ladder',
        detail: counts.ladders
          ? 'A ladder version exists.'
          : "Copy the starter ladder (seven rungs, long tones at ♩ = 60 up to all twelve major scales), edit it to the district's own, and publish it.",
        done: counts.ladders > 0,
        actions: [{ label: 'Open the scale ladder', link: '/ladder' }],
      },
      {
        id: 'people',
        title: 'Add the people who sign in',
        detail:
          counts.people > 1
            ? `${counts.people} people sign in.`
            : 'Directors, the instrument technician and read-only viewers, each with their schools.',
        done: counts.people > 1,
        actions: [{ label: 'Add people', link: '/people' }],
      },
    ];
  });

  protected readonly remaining = computed(
    () => this.steps()?.filter((step) => !step.done).length ?? 0,
  );
}
