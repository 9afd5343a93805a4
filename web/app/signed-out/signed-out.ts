import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';

/** Where the identity provider sends people back after sign-out. */
@Component({
  selector: 'tb-signed-out',
  imports: [MatButtonModule],
  template: `
    <main class="signed-out">
      <div class="tb-card">
        <div class="brand">Tuttiboard</div>
        <h1>You are signed out</h1>
        <p>Your session has ended on this device. Student records stay private until someone signs in again.</p>
        <a mat-flat-button href="/auth/sign-in">Sign in again</a>
      </div>
    </main>
  `,
  styles: `
    .signed-out { min-height: 100vh; display: grid; place-items: center; }
    .tb-card { max-width: 28rem; padding: 32px; }
    .brand { color: var(--tb-brass); font-weight: 700; text-transform: uppercase; letter-spacing: .06em; font-size: .8rem; }
    h1 { color: var(--tb-teal-deep); margin: 8px 0; font-size: 1.4rem; }
    p { line-height: 1.5; color: var(--tb-text-muted); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SignedOut {}
