// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { Injector, runInInjectionContext, type EnvironmentInjector } from '@angular/core';
import { Subject, throwError, type Observable } from 'rxjs';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { injectTypedSearch } from './typed-search';

/** Runs `injectTypedSearch` in an injector whose destruction the test calls. */
function typedSearch(search: (text: string) => Observable<readonly string[]>) {
  // Injector.create makes an environment injector, its own DestroyRef.
  const injector = Injector.create({ providers: [] }) as EnvironmentInjector;
  const found = runInInjectionContext(injector, () => injectTypedSearch(search));
  return { found, destroy: () => injector.destroy() };
}

describe('injectTypedSearch', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('should search only for the text typed last, 200 ms after the last keystroke, trimmed', () => {
    const asked: string[] = [];
    const answers = new Subject<readonly string[]>();
    const { found: search } = typedSearch((text) => {
      asked.push(text);
      return answers;
    });
    search.typed('Wa');
    vi.advanceTimersByTime(150);
    search.typed(' Walsh ');
    vi.advanceTimersByTime(199);
    expect(asked).toEqual([]);
    vi.advanceTimersByTime(1);
    expect(asked).toEqual(['Walsh']);
    expect(search.searched()).toBe(false);
    answers.next(['Walsh, Ada']);
    expect(search.found()).toEqual(['Walsh, Ada']);
    expect(search.searched()).toBe(true);
  });

  it('should drop the answer of a search a newer one replaced', () => {
    const answers = new Map([
      ['tr', new Subject<readonly string[]>()],
      ['trumpet', new Subject<readonly string[]>()],
    ]);
    const { found: search } = typedSearch((text) => answers.get(text)!);
    search.typed('tr');
    vi.advanceTimersByTime(200);
    search.typed('trumpet');
    vi.advanceTimersByTime(200);
    answers.get('tr')!.next(['TR-001', 'TR-002']);
    answers.get('trumpet')!.next(['TR-002']);
    expect(search.found()).toEqual(['TR-002']);
  });

  it('should find nothing when the search fails, and clear the rows when the text is blank', () => {
    const { found: search } = typedSearch((text) =>
      text === 'oops' ? throwError(() => new Error('offline')) : new Subject(),
    );
    search.typed('oops');
    vi.advanceTimersByTime(200);
    expect(search.found()).toEqual([]);
    expect(search.searched()).toBe(true);
    search.typed('   ');
    expect(search.searched()).toBe(false);
  });

  it('should stop searching when its component is destroyed', () => {
    const asked: string[] = [];
    const { found: search, destroy } = typedSearch((text) => {
      asked.push(text);
      return new Subject();
    });
    destroy();
    search.typed('clarinet');
    vi.advanceTimersByTime(200);
    expect(asked).toEqual([]);
  });
});
