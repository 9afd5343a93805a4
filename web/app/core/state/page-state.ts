import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressSpinnerModule } from '@angular/material/progress-spinner';

/** A designed loading, empty or error state, with room for the next step's buttons. */
@Component({
  selector: 'tb-page-state',
  imports: [MatIconModule, MatProgressSpinnerModule],
  template: `
    <div class="state" [class]="kind()" [attr.role]="kind() === 'error' ? 'alert' : 'status'">
      @if (kind() === 'loading') {
        <mat-spinner diameter="36" aria-label="Loading" />
      } @else {
        <span class="badge" aria-hidden="true">
          <mat-icon [svgIcon]="kind() === 'error' ? 'cloud_off' : icon()" />
        </span>
      }
      <h2>{{ title() }}</h2>
      @if (message()) {
        <p>{{ message() }}</p>
      }
      <div class="actions"><ng-content /></div>
    </div>
  `,
  styles: `
    .state {
      display: flex;
      flex-direction: column;
      align-items: center;
      text-align: center;
      gap: 8px;
      padding: 48px 24px;
      border: 1px dashed var(--tb-line);
      border-radius: var(--tb-radius);
      background: var(--tb-surface);
    }
    .badge {
      display: grid;
      place-items: center;
      width: 56px;
      height: 56px;
      border-radius: 50%;
      background: var(--tb-brass-soft);
      mat-icon {
        width: 28px;
        height: 28px;
        fill: #5a3a00;
      }
    }
    .error .badge {
      background: #ffdad6;
      mat-icon {
        fill: var(--tb-danger);
      }
    }
    h2 {
      margin: 8px 0 0;
      font-size: 1.1rem;
      font-weight: 600;
    }
    p {
      margin: 0;
      max-width: 36rem;
      color: var(--tb-text-muted);
      line-height: 1.5;
    }
    .actions {
      margin-top: 8px;
      display: flex;
      gap: 8px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PageState {
  readonly kind = input<'loading' | 'empty' | 'error'>('loading');
  readonly title = input('Loading…');
  readonly message = input('');
  readonly icon = input('info');
}
