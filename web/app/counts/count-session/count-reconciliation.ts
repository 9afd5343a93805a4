import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import type { CountDetail } from '@shared/api/count';

/** One group of the reconciliation, as a card with its count and its instruments. */
interface Group {
  id: string;
  title: string;
  explanation: string;
  icon: string;
  tone: 'ok' | 'warn' | 'danger' | 'info';
  instruments: {
    id: number;
    assetTag: string;
    instrumentName: string;
    homeSchoolCode: string;
    vendor?: string | null;
  }[];
  tags: string[];
}

/** How a count reconciles with the fleet: found, found elsewhere, not found, unknown tags. */
@Component({
  selector: 'tb-count-reconciliation',
  imports: [MatIconModule, RouterLink],
  template: `
    <h2 class="section">Reconciliation</h2>
    <div class="groups" data-testid="reconciliation">
      @for (group of groups(); track group.id) {
        <section
          class="tb-card group"
          [class]="group.tone"
          [attr.aria-labelledby]="'group-' + group.id"
          [attr.data-group]="group.id"
        >
          <header>
            <mat-icon [svgIcon]="group.icon" aria-hidden="true" />
            <h3 [id]="'group-' + group.id">{{ group.title }}</h3>
            <span class="number" data-testid="group-count">{{
              group.instruments.length + group.tags.length
            }}</span>
          </header>
          <p class="tb-muted explanation">{{ group.explanation }}</p>
          <ul>
            @for (instrument of group.instruments.slice(0, 60); track instrument.id) {
              <li>
                <a class="tb-asset-tag" [routerLink]="['/instruments', instrument.id]">{{
                  instrument.assetTag
                }}</a>
                {{ instrument.instrumentName }}
                @if (group.id === 'at-vendor') {
                  <span class="tb-muted">· ticket says at {{ vendorOf(instrument) }}</span>
                }
                @if (group.id === 'elsewhere') {
                  <span class="tb-muted">· home {{ instrument.homeSchoolCode }}</span>
                }
              </li>
            }
            @for (tag of group.tags; track tag) {
              <li>
                <code>{{ tag }}</code>
              </li>
            }
          </ul>
          @if (group.instruments.length > 60) {
            <p class="tb-muted">and {{ group.instruments.length - 60 }} more</p>
          }
        </section>
      }
    </div>
  `,
  styles: `
    .section {
      margin: 0 0 12px;
      font-size: 1.1rem;
      font-weight: 600;
      color: var(--tb-teal-deep);
    }
    .groups {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(260px, 1fr));
      gap: 16px;
      align-items: start;
    }
    .group {
      padding: 14px 16px;
      border-top-width: 4px;
    }
    header {
      display: flex;
      align-items: center;
      gap: 8px;
    }
    h3 {
      flex: 1;
      margin: 0;
      font-size: 1rem;
      font-weight: 600;
    }
    .number {
      font-size: 1.4rem;
      font-weight: 700;
      font-variant-numeric: tabular-nums;
    }
    .explanation {
      font-size: 0.85rem;
      margin: 4px 0 8px;
    }
    ul {
      list-style: none;
      margin: 0;
      padding: 0;
      max-height: 260px;
      overflow: auto;
      li {
        padding: 3px 0;
        font-size: 0.9rem;
      }
    }
    // One rule per tone: the card's top rule and its icon in the tone's colour.
    @each $tone, $colour in (ok: --tb-ok, warn: --tb-warn, danger: --tb-danger, info: --tb-teal) {
      .#{$tone} {
        border-top-color: var(#{$colour});
        mat-icon {
          fill: var(#{$colour});
        }
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CountReconciliation {
  readonly count = input.required<CountDetail>();

  protected vendorOf(instrument: { vendor?: string | null }): string {
    return instrument.vendor ?? 'the vendor';
  }

  protected readonly groups = computed<Group[]>(() => {
    const { reconciliation, schoolCode } = this.count();
    return [
      {
        id: 'found',
        title: 'Found where expected',
        explanation: `Home school ${schoolCode}, and scanned here.`,
        icon: 'check_circle',
        tone: 'ok',
        instruments: reconciliation.found,
        tags: [],
      },
      {
        id: 'elsewhere',
        title: 'Found, home elsewhere',
        explanation: 'Scanned here, but another school is their home: send back or transfer.',
        icon: 'swap_horiz',
        tone: 'warn',
        instruments: reconciliation.foundElsewhere,
        tags: [],
      },
      {
        id: 'at-vendor',
        title: 'Scanned, but at the vendor',
        explanation:
          'A repair ticket says these were sent to the vendor: close or correct the ticket.',
        icon: 'local_shipping',
        tone: 'warn',
        instruments: reconciliation.atVendor,
        tags: [],
      },
      {
        id: 'not-found',
        title: 'Not found',
        explanation: 'Expected on the shelf here and not scanned yet. Closing marks these missing.',
        icon: 'help',
        tone: 'danger',
        instruments: reconciliation.notFound,
        tags: [],
      },
      {
        id: 'unknown',
        title: 'Unknown tags',
        explanation:
          'Scanned tags the fleet does not know: check the label, or add the instrument.',
        icon: 'error',
        tone: 'danger',
        instruments: [],
        tags: reconciliation.unknownTags,
      },
      {
        id: 'on-loan',
        title: 'Out on loan',
        explanation: 'Home here but lent to students, so not expected on the shelf.',
        icon: 'handshake',
        tone: 'info',
        instruments: reconciliation.onLoan,
        tags: [],
      },
    ];
  });
}
