import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import type { ShortageReport } from '@shared/api/planning';

/** Per school, the district-provided instruments its players lack, and transfers that would help. */
@Component({
  selector: 'tb-shortage-list',
  imports: [MatIconModule],
  template: `
    <p class="tb-muted intro">
      Players enrolled this year on instruments the district provides, against the instruments ready
      to lend at their school.
    </p>
    @if (report().transfers.length > 0) {
      <section class="tb-card transfers" aria-labelledby="transfers-title">
        <h3 id="transfers-title">
          <mat-icon svgIcon="swap_horiz" aria-hidden="true" />Suggested transfers
        </h3>
        <ul data-testid="transfers">
          @for (transfer of report().transfers; track $index) {
            <li>
              Move <strong>{{ transfer.count }} {{ transfer.instrumentName }}</strong> from
              {{ transfer.fromSchoolCode }} to {{ transfer.toSchoolCode }}
              <span class="tb-muted">({{ transfer.assetTags.join(', ') }})</span>
            </li>
          }
        </ul>
      </section>
    }
    <div class="schools">
      @for (school of schools(); track school.schoolId) {
        <section class="tb-card" [attr.aria-labelledby]="'shortage-' + school.schoolId">
          <h3 [id]="'shortage-' + school.schoolId">{{ school.schoolName }}</h3>
          @if (school.lines.length === 0) {
            <p class="tb-muted">No players on district-provided instruments this year.</p>
          } @else {
            <table>
              <thead>
                <tr>
                  <th scope="col">Instrument</th>
                  <th scope="col" class="number">Players</th>
                  <th scope="col" class="number">On loan</th>
                  <th scope="col" class="number">Ready</th>
                  <th scope="col" class="number">Short</th>
                </tr>
              </thead>
              <tbody>
                @for (line of school.lines; track line.instrumentId) {
                  <tr>
                    <td>{{ line.instrumentName }}</td>
                    <td class="number">{{ line.players }}</td>
                    <td class="number">{{ line.onLoan }}</td>
                    <td class="number">{{ line.available }}</td>
                    <td class="number">
                      @if (line.shortfall > 0) {
                        <span class="short"
                          ><mat-icon svgIcon="warning" aria-hidden="true" />{{
                            line.shortfall
                          }}</span
                        >
                      } @else if (line.surplus > 0) {
                        <span class="tb-muted">{{ line.surplus }} spare</span>
                      } @else {
                        <span class="tb-muted">0</span>
                      }
                    </td>
                  </tr>
                }
              </tbody>
            </table>
          }
        </section>
      }
    </div>
  `,
  styles: `
    @use '../../../theme/plain-table';

    .intro {
      margin: -4px 0 12px;
    }
    h3 {
      display: flex;
      align-items: center;
      gap: 6px;
      margin: 0 0 8px;
      font-size: 1rem;
      font-weight: 600;
      mat-icon {
        fill: var(--tb-teal);
      }
    }
    .transfers {
      margin-bottom: 16px;
      ul {
        margin: 0;
        padding-left: 20px;
        line-height: 1.7;
      }
    }
    .schools {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(340px, 1fr));
      gap: 16px;
      align-items: start;
    }
    @include plain-table.plain-table(5px 6px);
    @include plain-table.figure-heads(0.8rem);
    .short {
      display: inline-flex;
      align-items: center;
      gap: 4px;
      font-weight: 700;
      color: var(--tb-danger);
      mat-icon {
        width: 16px;
        height: 16px;
        fill: var(--tb-danger);
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ShortageList {
  readonly report = input.required<ShortageReport>();

  /** Schools with a shortfall first, then the rest. */
  protected readonly schools = computed(() =>
    [...this.report().schools].sort(
      (first, second) =>
        Number(second.lines.some((line) => line.shortfall > 0)) -
          Number(first.lines.some((line) => line.shortfall > 0)) ||
        first.schoolCode.localeCompare(second.schoolCode),
    ),
  );
}
