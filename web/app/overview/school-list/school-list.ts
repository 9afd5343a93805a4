import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { CountPipe } from '../../core/format/formats';
import { RouterLink } from '@angular/router';
import type { School } from '@shared/api/school';

/** The user's schools as a compact list, each linking to its page. */
@Component({
  selector: 'tb-overview-school-list',
  imports: [RouterLink, CountPipe],
  template: `
    <ul class="schools" data-testid="overview-schools">
      @for (school of schools(); track school.id) {
        <li>
          <span class="code">{{ school.code }}</span>
          <a class="name" [routerLink]="['/schools', school.id]">{{ school.name }}</a>
          <span class="tb-muted level">{{ school.level }}</span>
          <span class="count"
            ><strong>{{ school.studentCount ?? 0 | count }}</strong> students</span
          >
          <span class="count"
            ><strong>{{ school.ensembleCount ?? 0 }}</strong> ensembles</span
          >
        </li>
      }
    </ul>
  `,
  styles: `
    .schools {
      list-style: none;
      margin: 0;
      padding: 0;
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(min(100%, 380px), 1fr));
      gap: 0 24px;
    }
    li {
      display: grid;
      grid-template-columns: 56px 1fr 80px 100px 96px;
      align-items: center;
      gap: 8px;
      padding: 8px 4px;
      border-bottom: 1px solid var(--tb-line);
      font-size: 0.9rem;
    }
    // A phone: the code and name on one line, the level and counts under the name.
    @media screen and (max-width: 599.98px) {
      li {
        grid-template-columns: 56px repeat(3, auto);
        justify-content: start;
        gap: 2px 12px;
      }
      .name {
        grid-column: 2 / -1;
      }
      .level {
        grid-column: 2;
      }
    }
    .code {
      justify-self: start;
      font-size: 0.72rem;
      font-weight: 700;
      letter-spacing: 0.06em;
      background: var(--tb-brass-soft);
      color: #3a2600;
      padding: 2px 8px;
      border-radius: 999px;
    }
    .name {
      font-weight: 600;
      text-decoration: none;
      &:hover {
        text-decoration: underline;
      }
    }
    .level {
      text-transform: capitalize;
    }
    .count {
      text-align: right;
      font-variant-numeric: tabular-nums;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class OverviewSchoolList {
  readonly schools = input.required<School[]>();
}
