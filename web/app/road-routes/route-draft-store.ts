import { Injectable, computed, signal } from '@angular/core';
import { EMPTY_DRAFT, RouteDraftHistory, type RouteDraftState } from './route-draft';

/** One piece of map work: applied at once, or a promise for work that waits on the server (a path). */
export type DraftTask = () => void | Promise<void>;

/**
 * The route being edited, its undo/redo history and the map work waiting its turn. Provided by
 * the route editor itself, so each editor has its own.
 *
 * Map work runs one piece at a time in the order it was asked for: a click made while a path
 * along the roads is still being found waits for that path and is then applied, instead of being
 * dropped. Work asked for while nothing is waiting runs at once (synchronously), so tools that
 * need no server answer (stops, speed limits, unsnapped vertices) act exactly when clicked.
 */
@Injectable()
export class RouteDraftStore {
  private readonly history = new RouteDraftHistory();
  private readonly state = signal<RouteDraftState>(EMPTY_DRAFT);
  private readonly undoable = signal(false);
  private readonly redoable = signal(false);
  private readonly waiting: DraftTask[] = [];
  private readonly waitingCount = signal(0);
  private readonly busy = signal(false);
  private draining = false;
  /** Bumped by `reset`: work started for an earlier draft must not touch the new one. */
  private generation = 0;

  /** The draft on screen. */
  readonly draft = this.state.asReadonly();
  readonly canUndo = this.undoable.asReadonly();
  readonly canRedo = this.redoable.asReadonly();
  /** Whether a piece of map work is waiting on the server (a path along the roads). */
  readonly isWorking = this.busy.asReadonly();
  /** Map clicks waiting for the work before them. */
  readonly queued = this.waitingCount.asReadonly();
  readonly vertices = computed(() => this.state().vertices, { equal: (a, b) => a === b });

  /** Applies one edit as one undoable step; an edit that changes nothing is not recorded. */
  apply(change: (state: RouteDraftState) => RouteDraftState): void {
    this.publish(this.history.apply(change));
  }

  undo(): void {
    this.publish(this.history.undo());
  }

  redo(): void {
    this.publish(this.history.redo());
  }

  /** Starts over from `state` (a loaded route or an empty one) with no history and no waiting work. */
  reset(state: RouteDraftState): void {
    this.generation++;
    this.waiting.length = 0;
    this.waitingCount.set(0);
    this.history.reset(state);
    this.publish(state);
  }

  /**
   * Runs `task` now when nothing is waiting, otherwise after the work queued before it. The task
   * reads the draft when it runs, so it builds on every edit made before it.
   */
  enqueue(task: DraftTask): void {
    this.waiting.push(task);
    this.waitingCount.set(this.waiting.length);
    if (!this.draining) void this.drain();
  }

  /** Whether work started under `token` (from `ticket()`) still belongs to the draft on screen. */
  isCurrent(token: number): boolean {
    return token === this.generation;
  }

  /** The current draft's token, for work that outlives a `reset`. */
  ticket(): number {
    return this.generation;
  }

  private async drain(): Promise<void> {
    this.draining = true;
    try {
      while (this.waiting.length > 0) {
        const task = this.waiting.shift()!;
        this.waitingCount.set(this.waiting.length);
        try {
          const pending = task();
          if (pending) {
            this.busy.set(true);
            await pending;
          }
        } catch (error: unknown) {
          // A failed piece of work must not hold up the clicks behind it; the tasks report
          // their own expected failures, so this is a fault worth a line in the console.
          console.warn('Route edit failed', error);
        } finally {
          this.busy.set(false);
        }
      }
    } finally {
      this.draining = false;
    }
  }

  private publish(state: RouteDraftState): void {
    this.state.set(state);
    this.undoable.set(this.history.canUndo);
    this.redoable.set(this.history.canRedo);
  }
}
