import '../screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  inject,
  signal,
  type Signal,
  type WritableSignal,
} from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { BreakpointObserver } from '@angular/cdk/layout';
import { MatSidenavModule } from '@angular/material/sidenav';
import { NavigationList, type NavigationGroup } from './navigation-list';

/**
 * The main navigation as a modal drawer for narrow windows (Material's sidenav in "over" mode:
 * backdrop, Escape to close, focus kept inside while open and given back after). The shell
 * loads it only when the window is narrow, so wide screens never download it.
 */
@Component({
  selector: 'tb-navigation-drawer',
  imports: [MatSidenavModule, NavigationList],
  template: `
    <mat-sidenav-container class="layer" [class.open]="open()" [hasBackdrop]="true">
      <mat-sidenav
        class="drawer"
        mode="over"
        autoFocus="first-tabbable"
        [opened]="open()"
        (openedChange)="open.set($event)"
        data-testid="navigation-drawer"
      >
        <nav aria-label="Main">
          <tb-navigation-list [groups]="groups()" place="drawer" (chosen)="choose()" />
        </nav>
      </mat-sidenav>
    </mat-sidenav-container>
  `,
  styles: `
    .layer {
      position: fixed;
      inset: 0;
      z-index: 20;
      background: transparent;
      pointer-events: none;
      --mat-sidenav-container-shape: 16px;
      --mat-sidenav-container-background-color: #0f3b3f;
      --mat-sidenav-container-text-color: #e6f1f0;
      --mat-sidenav-container-width: min(300px, 85vw);
    }
    .layer.open {
      pointer-events: auto;
    }
    nav {
      padding: 16px 12px 24px;
    }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class NavigationDrawer {
  // Set by the shell, which creates the drawer on demand (see Shell.openDrawer), so they are
  // plain fields rather than inputs: the shell's initial code stays free of the binding API.
  /** The navigation's groups. */
  groups: Signal<NavigationGroup[]> = signal([]);
  /** Whether the drawer is open, shared with the shell's menu button. */
  open: WritableSignal<boolean> = signal(false);
  /** Called when the user follows one of the links. */
  chosen: () => void = () => undefined;

  constructor() {
    // A window that grows past the drawer's width (a tablet turned sideways) shows the rail:
    // an open drawer over it would be a second navigation.
    inject(BreakpointObserver)
      .observe('(min-width: 840px)')
      .pipe(takeUntilDestroyed())
      // The window's width is a stream (BreakpointObserver), for the life of the drawer.
      .subscribe((state) => {
        if (state.matches) this.open.set(false);
      });
  }

  protected choose(): void {
    this.chosen();
    this.open.set(false);
  }
}
