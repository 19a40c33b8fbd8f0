import type { ComponentFixture } from '@angular/core/testing';

/**
 * Lets promise chains that started from a flushed HTTP request finish (they run after the
 * request's pending task has ended), then waits for Angular to render.
 */
export async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 0));
  await fixture.whenStable();
}
