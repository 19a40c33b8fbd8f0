import { ApplicationRef, Injector, resource, runInInjectionContext, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { describe, expect, it } from 'vitest';
import { storedResult } from '../../../web/app/ui/polled-resource';

interface Result {
  id: string;
  figure: number;
}

/** A result resource whose answers the test gives, one per request, by id. */
function setUp() {
  const id = signal('a');
  const answers: { id: string; settle: (value: Result | null | Error) => void }[] = [];
  const injector = TestBed.inject(Injector);
  const source = runInInjectionContext(injector, () =>
    resource({
      params: () => ({ id: id() }),
      loader: ({ params }) =>
        new Promise<Result | null>((resolve, reject) =>
          answers.push({ id: params.id, settle: (value) => (value instanceof Error ? reject(value) : resolve(value)) }),
        ),
    }),
  );
  const stored = runInInjectionContext(injector, () => storedResult(id, source));
  const settle = async (value: Result | null | Error) => {
    TestBed.tick();
    answers.at(-1)!.settle(value);
    await TestBed.inject(ApplicationRef).whenStable();
  };
  return { id, source, stored, settle };
}

describe('storedResult', () => {
  it('is loading until the answer comes, then shows it', async () => {
    const { stored, settle } = setUp();
    expect(stored.state()).toEqual({ status: 'loading' });
    expect(stored.loadState()).toEqual({ status: 'loading' });
    await settle({ id: 'a', figure: 1 });
    expect(stored.state()).toEqual({ status: 'ready', result: { id: 'a', figure: 1 } });
    expect(stored.loadState()).toEqual({ status: 'ready' });
  });

  it('keeps the shown result while the same id reloads, and never shows it for another id', async () => {
    const { id, source, stored, settle } = setUp();
    await settle({ id: 'a', figure: 1 });
    source.reload();
    TestBed.tick();
    expect(stored.shown()).toEqual({ id: 'a', figure: 1 });
    id.set('b');
    TestBed.tick();
    expect(stored.shown()).toBeUndefined();
    expect(stored.state()).toEqual({ status: 'loading' });
  });

  it('says when none is stored, and names a failed load', async () => {
    const none = setUp();
    await none.settle(null);
    expect(none.stored.state()).toEqual({ status: 'none' });
    expect(none.stored.loadState()).toEqual({ status: 'ready' });
    const failed = setUp();
    await failed.settle(new Error('boom'));
    const state = failed.stored.state();
    expect(state.status).toBe('error');
    expect(failed.stored.loadState().status).toBe('error');
  });
});
