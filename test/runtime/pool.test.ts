import { WorkerPool, poolSize } from '../../src/runtime/pool';
import { KnotwiseError, isKnotwiseError } from '../../src/engine';
import { fakeWorkers } from './fakeWorker';

const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('WorkerPool with in-process workers', () => {
  test('runs jobs on at most `size` workers and answers each caller with its own result', async () => {
    const fw = fakeWorkers((r: { v: number }) => r.v * 2);
    const pool = new WorkerPool<{ v: number }, number>(fw.factory, 2);
    const handles = [1, 2, 3, 4, 5].map((v) => pool.run({ v }));
    expect(pool.running).toBe(2);
    expect(pool.queued).toBe(3);
    expect(await Promise.all(handles.map((h) => h.promise))).toEqual([2, 4, 6, 8, 10]);
    expect(fw.started).toBe(2);
    expect(new Set(handles.map((h) => h.id)).size).toBe(5);
    pool.close();
  });

  test('a KnotwiseError thrown in the worker arrives as a KnotwiseError with its code and message', async () => {
    const fw = fakeWorkers(() => { throw new KnotwiseError('bad-option', 'folds must be an integer from 2 to 50; got 1.'); });
    const pool = new WorkerPool(fw.factory, 1);
    const err: any = await pool.run({}).promise.catch((e) => e);
    expect(isKnotwiseError(err)).toBe(true);
    expect(err).toBeInstanceOf(KnotwiseError);
    expect(err.code).toBe('bad-option');
    expect(err.message).toBe('folds must be an integer from 2 to 50; got 1.');
    // Anything else arrives as a plain Error with its message, and the worker goes on.
    const fw2 = fakeWorkers((r: { boom: boolean }) => { if (r.boom) throw new TypeError('x is undefined'); return 1; });
    const pool2 = new WorkerPool<{ boom: boolean }, number>(fw2.factory, 1);
    const e2: any = await pool2.run({ boom: true }).promise.catch((e) => e);
    expect(isKnotwiseError(e2)).toBe(false);
    expect(e2.message).toBe('x is undefined');
    expect(await pool2.run({ boom: false }).promise).toBe(1);
    expect(fw2.started).toBe(1);
    pool.close(); pool2.close();
  });

  test('cancelling a running job terminates its worker, starts a replacement, and the next job runs there', async () => {
    const fw = fakeWorkers((r: { v: number }) => r.v, (r) => (r.v === 1 ? 10_000 : 5));
    const pool = new WorkerPool<{ v: number }, number>(fw.factory, 1);
    const long = pool.run({ v: 1 });
    const queued = pool.run({ v: 2 });
    await wait(5);
    long.cancel();
    const err = await long.promise.catch((e) => e);
    expect(err.code).toBe('cancelled');
    expect(fw.terminated).toBe(1);
    expect(fw.started).toBe(2);
    expect(await queued.promise).toBe(2);
    expect(pool.stats).toMatchObject({ jobsCancelled: 1, workersTerminated: 1, workersStarted: 2 });
    // The cancelled job's function never finished, so its answer never came.
    expect(fw.ran).toEqual([{ v: 2 }]);
    pool.close();
  });

  test('with a loaded reserve worker, a cancelled job\'s worker is replaced at once and the pool is idle without waiting for a start-up', async () => {
    const fw = fakeWorkers((r: { v: number }) => r.v, (r) => (r.v === 1 ? 10_000 : 5));
    const pool = new WorkerPool<{ v: number }, number>(fw.factory, 1, 1);
    const long = pool.run({ v: 1 });
    expect(fw.started).toBe(2); // the worker and its reserve
    await wait(5);
    expect(pool.reserved).toBe(1);
    long.cancel();
    await long.promise.catch(() => undefined);
    let idle = false;
    void pool.whenIdle().then(() => { idle = true; });
    await Promise.resolve();
    await Promise.resolve();
    expect(idle).toBe(true); // the reserve was already loaded
    expect(fw.started).toBe(3); // a new reserve is loading
    expect(pool.reserved).toBe(0);
    expect(await pool.run({ v: 2 }).promise).toBe(2);
    pool.close();
    expect(fw.terminated).toBe(3);
  });

  test('cancelling a queued job drops it without touching any worker', async () => {
    const fw = fakeWorkers((r: { v: number }) => r.v);
    const pool = new WorkerPool<{ v: number }, number>(fw.factory, 1);
    const a = pool.run({ v: 1 });
    const b = pool.run({ v: 2 });
    b.cancel();
    expect((await b.promise.catch((e) => e)).code).toBe('cancelled');
    expect(await a.promise).toBe(1);
    expect(fw.terminated).toBe(0);
    expect(fw.ran).toEqual([{ v: 1 }]);
    pool.close();
  });

  test('progress reports reach the caller in order, before the result', async () => {
    const fw = fakeWorkers((_r, c) => { c.onProgress?.({ fraction: 0, stage: 'a' }); c.onProgress?.({ fraction: 1, stage: 'b' }); return 7; });
    const pool = new WorkerPool(fw.factory, 1);
    const seen: string[] = [];
    const h = pool.run({}, (p) => seen.push(p.stage));
    expect(await h.promise).toBe(7);
    expect(seen).toEqual(['a', 'b']);
    pool.close();
  });

  test('a worker that dies rejects its job and is replaced for the next one', async () => {
    let fail: ((e: Error) => void) | null = null;
    let started = 0;
    const pool = new WorkerPool<number, number>((onMessage, onFailure) => {
      started++;
      const n = started;
      fail = onFailure;
      return { postMessage: (m: any) => { if (n > 1) setTimeout(() => onMessage({ type: 'result', id: m.id, result: m.request + 1 }), 1); }, terminate: () => undefined };
    }, 1);
    const h = pool.run(1);
    fail!(new Error('out of memory'));
    expect((await h.promise.catch((e) => e)).message).toMatch(/the worker stopped: out of memory/);
    expect(await pool.run(2).promise).toBe(3);
    expect(started).toBe(2);
    pool.close();
  });

  test('pool size follows the cores, from 1 to at most 4', () => {
    expect([poolSize(1), poolSize(2), poolSize(8), poolSize(undefined), poolSize(0)]).toEqual([1, 2, 4, 1, 1]);
    expect(() => new WorkerPool(fakeWorkers(() => 0).factory, 0)).toThrow(/pool size must be a whole number >= 1; got 0/);
  });
});
