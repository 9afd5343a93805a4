import '../screen-kit';
import {
  ChangeDetectionStrategy,
  Component,
  Injector,
  computed,
  inject,
  signal,
  viewChild,
  ViewContainerRef,
  type ComponentRef,
  type ElementRef,
} from '@angular/core';
import { takeUntilDestroyed, toSignal } from '@angular/core/rxjs-interop';
import { BreakpointObserver } from '@angular/cdk/layout';
import { NavigationEnd, Router, RouterOutlet } from '@angular/router';
import { filter, map } from 'rxjs';
import { MatIcon } from '@angular/material/icon';
import { roleLabels } from '@shared/api/roles';
import { CurrentUser } from '../auth/current-user';
import { CurrentDistrict } from '../district/current-district';
import { Icons } from '../icons';
import { LastVisit } from '../offline/last-visit';
import { unsentPassOffCount } from '../../pass-offs/unsent-pass-offs';
import { navigationGroups, visibleItems } from './navigation';
import type { NavigationDrawer } from './navigation-drawer';
import { NavigationList, type NavigationGroup } from './navigation-list';

/** Where the rail shows instead of the drawer: Material Design 3's expanded window class. */
const railQuery = '(min-width: 840px)';

/**
 * The frame of every signed-in page: the navigation and the top bar. Its layout follows
 * Material Design 3's window size classes (m3.material.io, "Applying layout: window size
 * classes") in shell.scss: below 840 px (compact and medium) the navigation is a modal drawer
 * behind a menu button; from 840 px an icon rail, so a tablet held sideways keeps its width for
 * the page; from 1,200 px the labelled rail. The layout is CSS; the rail's links are created only
 * where the rail shows, and the drawer's code is fetched on the first tap of the menu button, so
 * wide screens never download it.
 */
@Component({
  selector: 'tb-shell',
  imports: [RouterOutlet, MatIcon, NavigationList],
  templateUrl: './shell.html',
  styleUrl: './shell.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Shell {
  private readonly currentUser = inject(CurrentUser);
  private readonly currentDistrict = inject(CurrentDistrict);
  private readonly main = viewChild.required<ElementRef<HTMLElement>>('main');
  private readonly router = inject(Router);
  private readonly drawerHost = viewChild.required('drawerHost', { read: ViewContainerRef });
  private drawer: Promise<ComponentRef<NavigationDrawer>> | null = null;
  private readonly breakpoints = inject(BreakpointObserver);
  /**
   * Whether the window is wide enough for the rail (the 840 px of shell.scss). Below it the rail
   * is hidden, so its links are not created at all: on a phone's first render that is a few dozen
   * links, icons and active-link checks of work that would show nothing.
   */
  protected readonly railShown = toSignal(
    this.breakpoints.observe(railQuery).pipe(map((state) => state.matches)),
    { initialValue: this.breakpoints.isMatched(railQuery) },
  );
  /** Whether the drawer is open (narrow windows only). */
  protected readonly drawerOpen = signal(false);
  /** Whether the navigation under way came from the rail, so its page's heading takes focus. */
  private fromRail = false;

  constructor() {
    inject(Icons).register();
    void this.currentDistrict.load();
    this.router.events
      .pipe(
        filter((event) => event instanceof NavigationEnd),
        takeUntilDestroyed(),
      )
      // Router events are a stream, for the life of the shell.
      .subscribe(() => {
        if (!this.fromRail) return;
        this.fromRail = false;
        this.focusHeading(Date.now() + 5000);
      });
  }

  /** Notes that the rail started a navigation. */
  protected headingAfterNavigation(): void {
    this.fromRail = true;
  }

  /** Opens the navigation drawer, fetching its code the first time. */
  protected async openDrawer(): Promise<void> {
    this.drawer ??= import('./navigation-drawer').then(({ NavigationDrawer }) => {
      const drawer = this.drawerHost().createComponent(NavigationDrawer);
      drawer.instance.groups = this.groups;
      drawer.instance.open = this.drawerOpen;
      drawer.instance.chosen = () => this.headingAfterNavigation();
      return drawer;
    });
    (await this.drawer).changeDetectorRef.markForCheck();
    this.drawerOpen.set(true);
  }

  /**
   * Moves focus to the new page's heading once it is there (a lazy page renders a moment after
   * the navigation ends), so a screen reader announces the page and Tab goes on from its top
   * (WAI-ARIA Authoring Practices, "Developing a Keyboard Interface": focus after navigation).
   */
  private focusHeading(until: number): void {
    const heading = this.main().nativeElement.querySelector<HTMLElement>('h1');
    if (heading) {
      if (!heading.hasAttribute('tabindex')) heading.setAttribute('tabindex', '-1');
      heading.focus();
      return;
    }
    if (Date.now() < until) setTimeout(() => this.focusHeading(until), 50);
  }

  protected readonly me = this.currentUser.me;
  protected readonly district = this.currentDistrict.district;

  private readonly injector = inject(Injector);
  private readonly lastVisit = inject(LastVisit);

  /**
   * The sign-out form is a plain POST. Before it goes, the app asks when pass-offs entered here
   * are still unsent, clears what this device kept of the visit, and notes the sign-out so no
   * 401 signs the user back in.
   */
  protected async signingOut(event: SubmitEvent): Promise<void> {
    event.preventDefault();
    const form = event.target as HTMLFormElement;
    const unsent = unsentPassOffCount(this.me()?.id ?? 0);
    if (unsent > 0) {
      const { askToSignOutWithUnsent } = await import('../auth/sign-out-question');
      if (!(await askToSignOutWithUnsent(this.injector, unsent))) return;
    }
    this.currentUser.markSigningOut();
    await this.lastVisit.forget();
    form.submit();
  }
  protected readonly roleLabel = computed(() => {
    const me = this.me();
    return me ? roleLabels[me.role] : '';
  });
  protected readonly schoolLine = computed(() => {
    const me = this.me();
    if (!me) return '';
    if (me.allSchools) return 'All schools';
    return me.schools.map((school) => school.name).join(', ') || 'No school assigned yet';
  });
  protected readonly groups = computed((): NavigationGroup[] => {
    const me = this.me();
    if (!me) return [];
    const items = visibleItems(me.role, this.currentUser.capabilities());
    return navigationGroups
      .map((group) => ({ ...group, items: items.filter((item) => item.group === group.id) }))
      .filter((group) => group.items.length > 0);
  });
  protected readonly initials = computed(() =>
    (this.me()?.name ?? '')
      .split(/\s+/)
      .map((part) => part[0])
      .slice(0, 2)
      .join(''),
  );

  /**
   * Moves focus into the content. Following a same-page link only moves the sequential focus
   * starting point (HTML Living Standard, "scroll to the fragment"), so the link focuses it itself.
   */
  protected skipToMain(event: Event) {
    event.preventDefault();
    this.main().nativeElement.focus();
  }
}
