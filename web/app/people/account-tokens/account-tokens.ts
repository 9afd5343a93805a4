import '../../core/screen-kit';
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { TokenList } from '../token-list/token-list';

/** A director's or technician's own API tokens, for scripts that call Tuttiboard. */
@Component({
  selector: 'tb-account-tokens',
  imports: [TokenList],
  template: `
    <div class="tb-page">
      <header class="tb-page-header">
        <div>
          <h1>API tokens</h1>
          <p>
            A token lets a script read and change what you may, as you. Keep it like a password and
            revoke it when the script is retired.
          </p>
        </div>
      </header>
      <tb-token-list [everyone]="false" />
    </div>
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AccountTokens {}
