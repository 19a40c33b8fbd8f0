import { ApplicationRef, Injector, runInInjectionContext, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { describe, expect, it } from 'vitest';
import { storedResult } from '../../../web/app/ui/polled-resource';

interface Result {
  id: string;
  figure: number;
}

/** A job computed at some time, and a result loader whose answers the test gives, one per request. */
function setUp(computedAt: string | null = '2026-12-03T10:00:00Z') {
  const id = signal('a');
  const job = signal<{ id: string; computedAt: string | null } | null>({ id: 'a', computedAt });
  const asked: string[] = [];
  const answers: ((value: Result | null | Error) => void)[] = [];
  const load = (jobId: string) =>
    new Promise<Result | null>((resolve, reject) => {
      asked.push(jobId);
      answers.push((value) => (value instanceof Error ? reject(value) : resolve(value)));
    });
  const stored = runInInjectionContext(TestBed.inject(Injector), () => storedResult(id, job, load));
  const stable = async () => {
    TestBed.tick();
    await TestBed.inject(ApplicationRef).whenStable();
  };
  const settle = async (value: Result | null | Error) => {
    TestBed.tick();
    answers.at(-1)!(value);
    await stable();
  };
  return { id, job, asked, stored, settle, stable };
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

  it('asks again only when the job was computed again, showing the previous result meanwhile', async () => {
    const { job, asked, stored, settle, stable } = setUp();
    await settle({ id: 'a', figure: 1 });
    // The page reads what it shows on every change; a linked signal computes when read.
    expect(stored.shown()).toEqual({ id: 'a', figure: 1 });
    job.set({ id: 'a', computedAt: '2026-12-03T10:00:00Z' });
    await stable();
    expect(asked).toEqual(['a']);
    job.set({ id: 'a', computedAt: '2026-12-03T11:00:00Z' });
    TestBed.tick();
    expect(asked).toEqual(['a', 'a']);
    expect(stored.shown()).toEqual({ id: 'a', figure: 1 });
    await settle({ id: 'a', figure: 2 });
    expect(stored.shown()).toEqual({ id: 'a', figure: 2 });
  });

  it('never shows a result for another id', async () => {
    const { id, job, stored, settle } = setUp();
    await settle({ id: 'a', figure: 1 });
    expect(stored.shown()).toEqual({ id: 'a', figure: 1 });
    id.set('b');
    job.set(null);
    TestBed.tick();
    expect(stored.shown()).toBeUndefined();
    expect(stored.state()).toEqual({ status: 'loading' });
  });

  it('has none without asking for a job never computed, or when none is stored; names a failed load', async () => {
    const never = setUp(null);
    await never.stable();
    expect(never.asked).toEqual([]);
    expect(never.stored.state()).toEqual({ status: 'none' });
    const none = setUp();
    await none.settle(null);
    expect(none.stored.state()).toEqual({ status: 'none' });
    expect(none.stored.loadState()).toEqual({ status: 'ready' });
    const failed = setUp();
    await failed.settle(new Error('boom'));
    expect(failed.stored.state().status).toBe('error');
    expect(failed.stored.loadState().status).toBe('error');
  });
});
