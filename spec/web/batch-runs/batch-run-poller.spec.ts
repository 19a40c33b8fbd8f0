import type { BatchRun } from '@shared/domain/board-summary';
import { pollBatchRun } from '../../../web/app/batch-runs/batch-run-poller';
import { batchProgressPercent } from '../../../web/app/batch-runs/batch-run-status';
import { aBatchRun } from '../support/review-builders';

describe('pollBatchRun', () => {
  beforeEach(() => vi.useFakeTimers());
  afterEach(() => vi.useRealTimers());

  it('asks every interval while the run is going and stops once it is done', async () => {
    const answers: BatchRun[] = [
      aBatchRun({ status: 'running', done: 1 }),
      aBatchRun({ status: 'running', done: 2 }),
      aBatchRun({ status: 'done', done: 3, finishedAt: '2026-11-30T10:02:00.000Z' }),
    ];
    const fetchRun = vi.fn(async () => answers.shift() ?? aBatchRun({ status: 'done', done: 3 }));
    const seen: number[] = [];

    pollBatchRun(fetchRun, (run) => seen.push(run.done), { intervalMs: 1_500 });
    await vi.advanceTimersByTimeAsync(1_499);
    expect(fetchRun).not.toHaveBeenCalled();
    await vi.advanceTimersByTimeAsync(1 + 1_500 * 2);
    expect(seen).toEqual([1, 2, 3]);

    await vi.advanceTimersByTimeAsync(15_000);

    expect(fetchRun).toHaveBeenCalledTimes(3);
  });

  it('keeps asking after a failed request and reports the failure', async () => {
    const fetchRun = vi
      .fn<() => Promise<BatchRun>>()
      .mockRejectedValueOnce(new Error('connection reset'))
      .mockResolvedValueOnce(aBatchRun({ status: 'done', done: 3 }));
    const failed = vi.fn();
    const update = vi.fn();

    pollBatchRun(fetchRun, update, { intervalMs: 1_000, failed });
    await vi.advanceTimersByTimeAsync(2_000);
    await vi.advanceTimersByTimeAsync(5_000);

    expect(failed).toHaveBeenCalledOnce();
    expect(update).toHaveBeenCalledOnce();
    expect(fetchRun).toHaveBeenCalledTimes(2);
  });

  it('asks no more once stopped, even with a request in flight', async () => {
    let resolve: (run: BatchRun) => void = () => undefined;
    const fetchRun = vi.fn(() => new Promise<BatchRun>((done) => (resolve = done)));
    const update = vi.fn();

    const poller = pollBatchRun(fetchRun, update, { intervalMs: 1_000 });
    await vi.advanceTimersByTimeAsync(1_000);
    poller.stop();
    resolve(aBatchRun({ status: 'running' }));
    await vi.advanceTimersByTimeAsync(10_000);

    expect(update).not.toHaveBeenCalled();
    expect(fetchRun).toHaveBeenCalledOnce();
  });
});

describe('batchProgressPercent', () => {
  it('counts failed scenarios as finished', () => {
    expect(batchProgressPercent({ total: 4, done: 2, failed: 1 })).toBe(75);
  });

  it('is complete for an empty run', () => {
    expect(batchProgressPercent({ total: 0, done: 0, failed: 0 })).toBe(100);
  });
});
