import '../screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  DestroyRef,
  computed,
  inject,
  signal,
} from '@angular/core';
import { MatIcon } from '@angular/material/icon';
import { CurrentUser } from '../auth/current-user';
import { Icons } from '../icons';
import { AppUpdates } from './app-updates';
import { LastVisit } from './last-visit';

/**
 * The strip over every page that says when the app works with no network (what still works and
 * what waits), and offers a new version of the app once the service worker has it. The new
 * version is never swapped in by itself: the user reloads when they choose, so no entry in
 * progress is lost under them (the pass-off queue keeps unsent entries across a reload).
 */
@Component({
  selector: 'tb-connection-notices',
  imports: [MatIcon],
  template: `
    @if (offline()) {
      <div class="notice offline" role="status" data-testid="offline-banner">
        <mat-icon svgIcon="cloud_off" aria-hidden="true" />
        <p>
          <strong>You are offline.</strong>
          @if (lastVisit.shownFrom(); as keptAt) {
            Showing your last visit ({{ keptText(keptAt) }}).
          } @else {
            Pages from your last visit still open.
          }
          @if (entersPassOffs()) {
            New pass-offs wait on this device and are sent when the network returns; other changes
            need the network.
          } @else {
            Changes need the network.
          }
        </p>
      </div>
    }
    @if (updateReady()) {
      <div class="notice update" role="status" data-testid="update-banner">
        <mat-icon svgIcon="refresh" aria-hidden="true" />
        <p>A new version of Tuttiboard is ready.</p>
        <button type="button" (click)="reload()">Reload to update</button>
      </div>
    }
  `,
  styles: `
    :host {
      display: block;
    }
    .notice {
      display: flex;
      align-items: center;
      gap: 12px;
      padding: 8px 20px;
      font-size: 14px;
      line-height: 1.4;
      p {
        margin: 0;
        flex: 1;
      }
      mat-icon {
        flex: none;
      }
    }
    .offline {
      background: #3b3530;
      color: #fff;
    }
    .update {
      background: var(--tb-brass-soft, #f6e7c4);
      color: #2b2117;
      button {
        font: inherit;
        font-weight: 600;
        border: 1px solid currentColor;
        border-radius: 6px;
        background: transparent;
        color: inherit;
        padding: 6px 12px;
        min-height: 36px;
        cursor: pointer;
      }
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConnectionNotices {
  protected readonly lastVisit = inject(LastVisit);
  private readonly online = signal(navigator.onLine !== false);
  /** Offline by the browser's word, or because the last reads came from the device. */
  protected readonly offline = computed(
    () => !this.online() || this.lastVisit.shownFrom() !== null,
  );
  protected readonly updateReady = inject(AppUpdates).ready;
  private readonly currentUser = inject(CurrentUser);
  /** Whether the user enters pass-offs, the one change that waits on the device. */
  protected readonly entersPassOffs = computed(() =>
    this.currentUser.capabilities().has('pass-offs:write'),
  );

  constructor() {
    inject(Icons).register();
    const goOnline = () => {
      this.online.set(true);
      // The next read that finds no server notes it again.
      this.lastVisit.answeredLive();
    };
    const goOffline = () => this.online.set(false);
    window.addEventListener('online', goOnline);
    window.addEventListener('offline', goOffline);
    inject(DestroyRef).onDestroy(() => {
      window.removeEventListener('online', goOnline);
      window.removeEventListener('offline', goOffline);
    });
  }

  private readonly keptFormat = new Intl.DateTimeFormat(undefined, {
    month: 'short',
    day: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
  });

  protected keptText(keptAt: number): string {
    return this.keptFormat.format(keptAt);
  }

  /** Loads the new version; the pass-off entry grid hands its open cell to the queue on the way out. */
  protected reload(): void {
    location.reload();
  }
}
