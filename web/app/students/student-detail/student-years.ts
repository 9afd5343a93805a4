import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { StudentDetail } from '@shared/api/student';

/** How each end of a year reads on the student's page. */
const outcomeLabels: Record<string, string> = {
  promoted: 'Promoted',
  'moving-up': 'Moved up',
  graduated: 'Graduated',
  leaving: 'Left the district',
  withdrawn: 'Withdrawn',
};

/** The student's past school years: school, grade, ensembles and rung at each year's end. */
@Component({
  selector: 'tb-student-years',
  template: `
    <section aria-labelledby="years-title">
      <h2 id="years-title">Past years</h2>
      @if (student().years.length === 0) {
        <p class="tb-muted">No past year yet: the first one is kept when the next year starts.</p>
      } @else {
        <ol class="years" data-testid="student-years">
          @for (year of student().years; track year.schoolYearId) {
            <li>
              <strong>{{ year.year }}</strong> · {{ year.schoolName }} · grade
              {{ year.grade === 0 ? 'K' : year.grade }}
              <span class="detail tb-muted">
                {{ year.ensembles.length ? year.ensembles.join(', ') : 'No ensemble' }} · rung
                {{ year.rung }} at the year's end · {{ outcome(year.outcome) }}
              </span>
            </li>
          }
        </ol>
      }
    </section>
  `,
  styles: `
    h2 {
      margin: 0 0 8px;
      font-size: 1rem;
      font-weight: 600;
    }
    .years {
      margin: 0;
      padding: 0;
      list-style: none;
      li {
        padding: 6px 0;
        border-bottom: 1px solid var(--tb-line);
      }
      li:last-child {
        border-bottom: 0;
      }
    }
    .detail {
      display: block;
      font-size: 0.88rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class StudentYears {
  readonly student = input.required<StudentDetail>();

  protected outcome(value: string): string {
    return outcomeLabels[value] ?? value;
  }
}
