import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import type { Overview } from '@shared/api/analytics';

/** The directors who have entered no pass-off for a while, so the coordinator can check in. */
@Component({
  selector: 'tb-quiet-directors',
  template: `
    <section class="tb-card quiet" aria-labelledby="quiet-heading">
      <h2 id="quiet-heading">No pass-offs entered for {{ quiet().days }} days</h2>
      @if (quiet().directors.length === 0) {
        <p class="tb-muted">
          Every director has entered pass-offs in the last {{ quiet().days }} days.
        </p>
      } @else {
        <ul>
          @for (director of quiet().directors; track director.userId) {
            <li>
              <a [href]="'mailto:' + director.email">{{ director.name }}</a>
              <span class="tb-muted"
                >{{ director.schoolCodes.join(', ') }} ·
                {{
                  director.lastEntryOn ? 'last entry ' + director.lastEntryOn : 'no entries yet'
                }}</span
              >
            </li>
          }
        </ul>
      }
    </section>
  `,
  styles: `
    .quiet {
      height: 100%;
      box-sizing: border-box;
    }
    h2 {
      margin: 0 0 8px;
      font-size: 1rem;
      font-weight: 600;
    }
    p {
      margin: 0;
      font-size: 0.9rem;
    }
    ul {
      list-style: none;
      margin: 0;
      padding: 0;
    }
    li {
      display: flex;
      flex-direction: column;
      padding: 6px 0;
      border-bottom: 1px solid var(--tb-line);
      font-size: 0.9rem;
    }
    li:last-child {
      border-bottom: 0;
    }
    span {
      font-size: 0.8rem;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class QuietDirectors {
  readonly quiet = input.required<Overview['quietDirectors']>();
}
