import { computed, type Resource, type Signal } from '@angular/core';
import { describeApiError } from '../core/api-error-message';

/**
 * Where a page's data stands: being loaded, loaded, or failed with a sentence a person can act
 * on. Pages whose data lives in their own signals use `LoadState` (no value); pages that keep the
 * answer here use `LoadState<T>`.
 */
export type LoadState<T = void> =
  { status: 'loading' } | { status: 'error'; message: string } | ([T] extends [void] ? { status: 'ready' } : { status: 'ready'; value: T });

export const LOADING = { status: 'loading' } as const;
export const LOADED = { status: 'ready' } as const;

/** A failed load, with the request's error in words. */
export function loadFailed(error: unknown): { status: 'error'; message: string } {
  return { status: 'error', message: describeApiError(error) };
}

/**
 * An Angular resource (`resource()` / `rxResource()`) as a `LoadState`: loading while its
 * params change or it reloads (the earlier request is cancelled), the error in words, or its value.
 */
export function loadStateOf<T>(source: Resource<T | undefined>): Signal<LoadState<T>> {
  return computed(() => {
    const status = source.status();
    if (status === 'error') return loadFailed(source.error()) as LoadState<T>;
    if (status === 'resolved' || status === 'local') return { status: 'ready', value: source.value() as T } as LoadState<T>;
    return LOADING as LoadState<T>;
  });
}
