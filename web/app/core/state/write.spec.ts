// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { HttpErrorResponse } from '@angular/common/http';
import { Subject } from 'rxjs';
import { describe, expect, it } from 'vitest';
import { createWrite } from './write';

describe('createWrite', () => {
  it('should be saving until the write answers, then done with its value', () => {
    const write = createWrite();
    const answer = new Subject<number>();
    const values: number[] = [];
    write.send(answer, { next: (value) => values.push(value) });
    expect(write.saving()).toBe(true);
    expect(write.done()).toBe(false);
    answer.next(7);
    answer.complete();
    expect(values).toEqual([7]);
    expect(write.saving()).toBe(false);
    expect(write.done()).toBe(true);
    expect(write.error()).toBeUndefined();
  });

  it('should keep the error and its API message when the write fails', () => {
    const write = createWrite();
    const answer = new Subject<number>();
    const seen: unknown[] = [];
    write.send(answer, { error: (error) => seen.push(error) });
    const refused = new HttpErrorResponse({
      status: 409,
      error: { error: { status: 409, code: 'conflict', message: 'Someone saved first.' } },
    });
    answer.error(refused);
    expect(seen).toEqual([refused]);
    expect(write.saving()).toBe(false);
    expect(write.done()).toBe(false);
    expect(write.error()).toBe(refused);
    expect(write.failure()).toBe('Someone saved first.');
  });

  it('should stay saving while a second write runs when the first answers', () => {
    const write = createWrite();
    const first = new Subject<void>();
    const second = new Subject<void>();
    write.send(first);
    write.send(second);
    first.complete();
    expect(write.saving()).toBe(true);
    second.complete();
    expect(write.saving()).toBe(false);
  });

  it('should clear the last failure when a new write starts', () => {
    const write = createWrite();
    const failing = new Subject<void>();
    write.send(failing);
    failing.error(new Error('offline'));
    expect(write.failure()).toBe('Something went wrong. Try again.');
    write.send(new Subject<void>());
    expect(write.error()).toBeUndefined();
    expect(write.failure()).toBe('');
  });
});
