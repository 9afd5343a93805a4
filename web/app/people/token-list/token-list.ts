import { WhenPipe } from '../../core/format/formats';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { catchError, map, of } from 'rxjs';
import type { CreatedToken } from '@shared/api/person';
import {
  defaultTokenLifetimeDays,
  longestTokenLifetimeDays,
  type ApiToken,
} from '@shared/api/token';
import { CurrentUser } from '../../core/auth/current-user';
import { errorMessage } from '../../core/parse';
import { LoadFailed } from '../../core/state/load-failed';
import { PageState } from '../../core/state/page-state';
import { PeopleData } from '../people-data';
import { ApiTokenData } from '../token-data';
import { TokenReveal } from '../token-reveal/token-reveal';
import { createWrite } from '../../core/state/write';

/**
 * API tokens with Revoke, and a way to make one for the signed-in user. The API answers the
 * coordinator every token and anyone else their own.
 */
@Component({
  selector: 'tb-token-list',
  imports: [
    WhenPipe,
    FormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    LoadFailed,
    PageState,
  ],
  templateUrl: './token-list.html',
  styleUrl: './token-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class TokenList {
  private readonly write = createWrite();
  private readonly tokens = inject(ApiTokenData);
  private readonly people = inject(PeopleData);
  private readonly dialog = inject(MatDialog);

  /** Whether the list holds everyone's tokens (the coordinator's view), with an owner column. */
  readonly everyone = input(false);

  protected readonly myId = inject(CurrentUser).me()?.id;
  protected readonly label = signal('');
  /** The lifetimes the form offers, in days: a month, the default 90 days, half a year, a year. */
  protected readonly lifetimes = [
    { days: 30, label: '30 days' },
    { days: defaultTokenLifetimeDays, label: `${defaultTokenLifetimeDays} days` },
    { days: 180, label: '180 days' },
    { days: longestTokenLifetimeDays, label: 'A year' },
  ];
  protected readonly lifetimeDays = signal(defaultTokenLifetimeDays);
  protected readonly now = Date.now();
  protected readonly creating = signal(false);
  protected readonly confirming = signal<number | null>(null);
  protected readonly notice = signal('');
  protected readonly failure = signal('');
  protected readonly list = rxResource({
    params: () => ({ limit: 500 }),
    stream: ({ params }) => this.tokens.list(params),
  });
  private readonly owners = rxResource({
    params: () => (this.everyone() ? { limit: 500 } : undefined),
    stream: ({ params }) =>
      this.people.list(params).pipe(
        map((page) => new Map(page.rows.map((person) => [person.id, person.name]))),
        catchError(() => of(new Map<number, string>())),
      ),
  });
  protected readonly liveCount = computed(
    () => (this.list.value()?.rows ?? []).filter((token) => this.isLive(token)).length,
  );

  /** Whether the token still works: not revoked and not past its expiry. */
  protected isLive(token: ApiToken): boolean {
    return !token.revokedAt && Date.parse(token.expiresAt) > this.now;
  }

  protected ownerName(token: ApiToken): string {
    return this.owners.value()?.get(token.userId) ?? token.userEmail;
  }

  protected create(): void {
    if (this.creating()) return;
    this.creating.set(true);
    this.failure.set('');
    this.notice.set('');
    const request = this.tokens.create({
      label: this.label().trim(),
      lifetimeDays: this.lifetimeDays(),
    });
    this.write.send(request, {
      next: (created) => {
        this.creating.set(false);
        this.label.set('');
        this.list.reload();
        this.dialog.open<TokenReveal, CreatedToken>(TokenReveal, {
          data: created,
          width: '600px',
          disableClose: true,
        });
      },
      error: (error: unknown) => {
        this.creating.set(false);
        this.failure.set(errorMessage(error, 'The token could not be made.'));
      },
    });
  }

  protected revoke(token: ApiToken): void {
    this.confirming.set(null);
    this.failure.set('');
    this.write.send(this.tokens.revoke(token.id), {
      next: () => {
        this.notice.set(
          `The token “${token.label || 'without a label'}” is revoked: scripts using it are refused from now on.`,
        );
        this.list.reload();
      },
      error: (error: unknown) =>
        this.failure.set(errorMessage(error, 'The token could not be revoked.')),
    });
  }
}
