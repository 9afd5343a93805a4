import '../core/screen-kit';
import { HttpClient } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { catchError, of } from 'rxjs';
import { MatButtonModule } from '@angular/material/button';

/** Where the identity provider sends people back after sign-out. */
@Component({
  selector: 'tb-signed-out',
  imports: [MatButtonModule],
  template: `
    <main class="signed-out">
      <div class="tb-card">
        <div class="brand">
          @if (brand()?.logoUrl; as logoUrl) {
            <img [src]="logoUrl" alt="" />
          }
          <span>{{ brand()?.name ?? 'Tuttiboard' }}</span>
        </div>
        <h1>You are signed out</h1>
        <p>
          Your session has ended on this device. Student records stay private until someone signs in
          again.
        </p>
        <a mat-flat-button href="/auth/sign-in">Sign in again</a>
      </div>
    </main>
  `,
  styles: `
    .signed-out {
      min-height: 100vh;
      display: grid;
      place-items: center;
    }
    .tb-card {
      max-width: 28rem;
      padding: 32px;
    }
    .brand {
      display: flex;
      align-items: center;
      gap: 10px;
      color: var(--tb-brass);
      font-weight: 700;
      text-transform: uppercase;
      letter-spacing: 0.06em;
      font-size: 0.8rem;
    }
    h1 {
      color: var(--tb-teal-deep);
      margin: 8px 0;
      font-size: 1.4rem;
    }
    .brand img {
      max-height: 40px;
      max-width: 160px;
    }
    p {
      line-height: 1.5;
      color: var(--tb-text-muted);
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignedOut {
  /** The district's name and logo, from the one address that answers before sign-in. */
  protected readonly brand = toSignal(
    inject(HttpClient)
      .get<{ name: string | null; logoUrl: string | null }>('/district-brand')
      .pipe(catchError(() => of(null))),
  );
}
