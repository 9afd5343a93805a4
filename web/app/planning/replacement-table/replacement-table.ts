import { ChangeDetectionStrategy, Component, computed, input, linkedSignal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import type { ReplacementLine } from '@shared/api/planning';
import { conditionLabels, dayText, money } from '../../instruments/instrument-labels';
import type { InstrumentCondition } from '@shared/api/instrument';

const firstRows = 60;
const percent = new Intl.NumberFormat('en-US', { style: 'percent', maximumFractionDigits: 0 });

/** The instruments due for replacement, with their depreciation figures. */
@Component({
  selector: 'tb-replacement-table',
  imports: [MatButtonModule, RouterLink],
  template: `
    <section class="tb-card" aria-labelledby="lines-title">
      <h2 id="lines-title">
        Due within {{ years() === 1 ? 'a year' : years() + ' years' }}
        <span class="tb-muted">· {{ lines().length }} instruments</span>
      </h2>
      @if (lines().length === 0) {
        <p class="tb-muted">No instrument reaches the end of its service life in this horizon.</p>
      } @else {
        <div class="scroll">
          <table data-testid="replacement-lines">
            <thead>
              <tr>
                <th scope="col">Asset tag</th>
                <th scope="col">Instrument</th>
                <th scope="col">School</th>
                <th scope="col">Condition</th>
                <th scope="col">Purchased</th>
                <th scope="col" class="number">Purchase cost</th>
                <th scope="col" class="number">Age</th>
                <th scope="col" class="number">Service life</th>
                <th scope="col" class="number">Current value</th>
                <th scope="col" class="number">Repairs to date</th>
                <th scope="col" class="number">Repairs ÷ value</th>
                <th scope="col">Replace by</th>
              </tr>
            </thead>
            <tbody>
              @for (line of shown(); track line.id) {
                <tr>
                  <td>
                    <a [routerLink]="['/instruments', line.id]">{{ line.assetTag }}</a>
                  </td>
                  <td>{{ line.instrumentName }}</td>
                  <td>{{ line.homeSchoolCode }}</td>
                  <td>{{ condition(line.condition) }}</td>
                  <td>{{ day(line.purchasedOn) }}</td>
                  <td class="number">{{ money(line.purchaseCostCents, true) }}</td>
                  <td class="number">{{ age(line.ageMonths) }}</td>
                  <td class="number">{{ line.serviceLifeYears }} yr</td>
                  <td class="number">{{ money(line.currentValueCents, true) }}</td>
                  <td class="number">{{ money(line.repairCostCents, true) }}</td>
                  <td class="number" [class.high]="(line.repairShareOfValue ?? 0) >= 0.5">
                    {{ share(line.repairShareOfValue) }}
                  </td>
                  <td>
                    @if (line.dueWithinYears === 0) {
                      <strong>Now</strong>
                    } @else {
                      {{ day(line.replaceBy) }}
                    }
                  </td>
                </tr>
              }
            </tbody>
          </table>
        </div>
        @if (lines().length > shown().length) {
          <button mat-stroked-button type="button" (click)="limit.set(lines().length)">
            Show all {{ lines().length }}
          </button>
        }
        <p class="tb-muted small">
          “Now”: past its service life, or unserviceable. Repairs ÷ value at 50% or more is in bold:
          repairing it again may cost more than it is worth.
        </p>
      }
    </section>
  `,
  styles: `
    h2 {
      margin: 0 0 10px;
      font-size: 1rem;
      font-weight: 600;
    }
    .scroll {
      overflow-x: auto;
    }
    table {
      width: 100%;
      border-collapse: collapse;
      font-size: 0.875rem;
    }
    th,
    td {
      text-align: left;
      padding: 6px 6px;
      border-bottom: 1px solid var(--tb-line);
    }
    td {
      white-space: nowrap;
    }
    th {
      font-size: 0.8rem;
      color: var(--tb-teal-deep);
      background: var(--tb-canvas);
      position: sticky;
      top: 0;
    }
    .number {
      text-align: right;
      font-variant-numeric: tabular-nums;
    }
    .high {
      font-weight: 700;
      color: var(--tb-danger);
    }
    button {
      margin-top: 10px;
    }
    .small {
      font-size: 0.85rem;
      margin: 10px 0 0;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReplacementTable {
  readonly lines = input.required<ReplacementLine[]>();
  readonly years = input(1);

  protected readonly limit = linkedSignal(() => {
    this.lines();
    return firstRows;
  });
  protected readonly shown = computed(() => this.lines().slice(0, this.limit()));
  protected readonly money = money;
  protected readonly day = dayText;

  protected condition(value: string): string {
    return conditionLabels[value as InstrumentCondition] ?? value;
  }

  protected age(months: number): string {
    const years = Math.floor(months / 12);
    const rest = months % 12;
    return years > 0 ? `${years} yr ${rest} mo` : `${rest} mo`;
  }

  protected share(value: number | null): string {
    return value === null ? '—' : percent.format(value);
  }
}
