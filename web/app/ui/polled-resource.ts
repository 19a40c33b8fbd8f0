import { computed, effect, linkedSignal, resource, type ResourceRef, type Signal, type WritableSignal } from '@angular/core';
import { describeApiError } from '../core/api-error-message';
import type { LoadState } from './load-state';

/**
 * The last answer of `source` for the current `id`: kept while the resource reloads or a reload
 * fails (the page stays readable), settable by the page (the answer to an action), and dropped as
 * soon as `id` changes, so an answer for an earlier id is never shown. Call in an injection context.
 */
export function latestAnswer<T extends { id: string }>(id: Signal<string>, source: ResourceRef<T | undefined>): WritableSignal<T | null> {
  return linkedSignal<{ id: string; value: T | null }, T | null>({
    source: () => ({ id: id(), value: source.hasValue() ? (source.value() ?? null) : null }),
    computation: (current, previous) => current.value ?? (previous?.value?.id === current.id ? previous.value : null),
  });
}

/**
 * Reloads `source` every `intervalMs` while `shown` holds something `isGoing` (a queued or running
 * job). One request at a time: the timer starts once the previous answer (or failure) is in. A new
 * answer, a failure, a new id or leaving the page clears the timer, and a settled answer stops the
 * reloading. Call in an injection context.
 */
export function reloadWhileGoing<T>(
  source: ResourceRef<unknown>,
  shown: Signal<T | null>,
  isGoing: (value: T) => boolean,
  intervalMs: number,
): void {
  effect((onCleanup) => {
    const value = shown();
    const status = source.status();
    if (value === null || !isGoing(value) || status === 'loading' || status === 'reloading') return;
    const timer = setTimeout(() => source.reload(), intervalMs);
    onCleanup(() => clearTimeout(timer));
  });
}

/** A job's stored result on its page: loading, none stored, shown, or failed with a message. */
export type StoredResultState<R> =
  { status: 'loading' } | { status: 'none' } | { status: 'ready'; result: R } | { status: 'error'; message: string };

/**
 * A job's stored result as its page shows it. `job` is the page's latest answer for the job (a
 * scenario, a service day); its result is asked for with `load` again only when the job was
 * computed again (`computedAt` changed), and is null while the job has never been computed or when
 * `load` says none is stored. `data` is the result's resource (for "Try again"); `shown` is the
 * newest answer for the current `id`, the previous one while a newer loads (never one for an
 * earlier id); `state` says what the page has; `loadState` is the load while nothing is shown, for
 * `<app-load-status>`. Call in an injection context.
 */
export function storedResult<R>(
  id: Signal<string>,
  job: Signal<{ id: string; computedAt: string | null } | null>,
  load: (jobId: string) => Promise<R | null>,
): {
  data: ResourceRef<R | null | undefined>;
  shown: Signal<R | null | undefined>;
  state: Signal<StoredResultState<R>>;
  loadState: Signal<LoadState>;
} {
  const key = computed(
    () => {
      const current = job();
      return current ? { jobId: current.id, computedAt: current.computedAt } : undefined;
    },
    { equal: (a, b) => a?.jobId === b?.jobId && a?.computedAt === b?.computedAt },
  );
  const data = resource({
    params: () => key(),
    loader: ({ params }) => (params.computedAt === null ? Promise.resolve(null) : load(params.jobId)),
  });
  const shown = linkedSignal<{ id: string; value: R | null | undefined }, R | null | undefined>({
    source: () => ({ id: id(), value: data.hasValue() ? data.value() : undefined }),
    computation: (current, previous) =>
      current.value !== undefined ? current.value : previous?.source.id === current.id && previous.value ? previous.value : undefined,
  });
  const state = computed<StoredResultState<R>>(() => {
    const result = shown();
    if (result) return { status: 'ready', result };
    if (result === null) return { status: 'none' };
    if (data.status() === 'error') return { status: 'error', message: describeApiError(data.error()) };
    return { status: 'loading' };
  });
  const loadState = computed<LoadState>(() => {
    const current = state();
    return current.status === 'loading' || current.status === 'error' ? current : { status: 'ready' };
  });
  return { data, shown, state, loadState };
}
