import { EMPTY_DRAFT, appendVertices, type LonLat } from '../../../web/app/road-routes/route-draft';
import { RouteDraftStore } from '../../../web/app/road-routes/route-draft-store';

const A: LonLat = [10, 46.0];
const B: LonLat = [10, 46.01];
const C: LonLat = [10, 46.02];

/** A path along the roads that the test answers by hand. */
function deferred(): { promise: Promise<void>; resolve: () => void } {
  let resolve!: () => void;
  const promise = new Promise<void>((done) => (resolve = done));
  return { promise, resolve };
}

describe('route draft store', () => {
  it('applies edits as undoable steps and redoes them', () => {
    const store = new RouteDraftStore();
    store.apply((state) => appendVertices(state, [A]));
    store.apply((state) => appendVertices(state, [B]));

    expect(store.draft().vertices).toEqual([A, B]);
    store.undo();
    expect(store.draft().vertices).toEqual([A]);
    expect(store.canRedo()).toBe(true);
    store.redo();
    expect(store.draft().vertices).toEqual([A, B]);
    expect(store.canRedo()).toBe(false);
  });

  it('runs work at once when nothing is waiting', () => {
    const store = new RouteDraftStore();
    store.enqueue(() => store.apply((state) => appendVertices(state, [A])));

    expect(store.draft().vertices).toEqual([A]);
    expect(store.isWorking()).toBe(false);
  });

  it('keeps a click made while a path is being found and applies it, in order, once the path arrives', async () => {
    const store = new RouteDraftStore();
    const path = deferred();
    store.enqueue(async () => {
      await path.promise;
      store.apply((state) => appendVertices(state, [A, B]));
    });
    store.enqueue(() => store.apply((state) => appendVertices(state, [C])));

    expect(store.isWorking()).toBe(true);
    expect(store.queued()).toBe(1);
    expect(store.draft().vertices).toEqual([]);
    path.resolve();
    await Promise.resolve();
    await new Promise((done) => setTimeout(done));

    expect(store.draft().vertices).toEqual([A, B, C]);
    expect(store.queued()).toBe(0);
    expect(store.isWorking()).toBe(false);
  });

  it('goes on with the next click when a piece of work fails', async () => {
    const store = new RouteDraftStore();
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => undefined);
    store.enqueue(() => Promise.reject(new Error('path service away')));
    store.enqueue(() => store.apply((state) => appendVertices(state, [C])));
    await new Promise((done) => setTimeout(done));

    expect(store.draft().vertices).toEqual([C]);
    expect(warn).toHaveBeenCalledOnce();
    warn.mockRestore();
  });

  it('drops waiting clicks when another route is loaded, and tells late work it is stale', async () => {
    const store = new RouteDraftStore();
    const path = deferred();
    let ticket = -1;
    store.enqueue(async () => {
      ticket = store.ticket();
      await path.promise;
      if (store.isCurrent(ticket)) store.apply((state) => appendVertices(state, [A]));
    });
    store.enqueue(() => store.apply((state) => appendVertices(state, [C])));
    store.reset(EMPTY_DRAFT);
    path.resolve();
    await new Promise((done) => setTimeout(done));

    expect(store.draft().vertices).toEqual([]);
    expect(store.canUndo()).toBe(false);
  });
});
