import { effect, linkedSignal, type ResourceRef, type Signal, type WritableSignal } from '@angular/core';

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
