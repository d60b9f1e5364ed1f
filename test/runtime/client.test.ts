import { AnalysisClient } from '../../src/runtime/client';
import { WorkerPool } from '../../src/runtime/pool';
import { fakeWorkers } from './fakeWorker';

type Req = { key: string; v: number; fail?: boolean; ms?: number; tail?: number };
const wait = (ms: number) => new Promise((r) => setTimeout(r, ms));

function setup(size = 2) {
  const fw = fakeWorkers((r: Req, c) => { c.onProgress?.({ fraction: 0, stage: 'started' }); if (r.fail) throw new Error(`failed ${r.v}`); return { v: r.v * 10 }; }, (r: Req) => r.ms ?? 20, (r: Req) => r.tail ?? 0);
  const pool = new WorkerPool<Req, { v: number }>(fw.factory, size);
  const client = new AnalysisClient<Req, { v: number }>((r, p) => pool.run(r, p), (r) => r.key, 3);
  return { fw, pool, client };
}

describe('AnalysisClient: a cache of promises in front of the pool', () => {
  test('ten concurrent calls with one key compute once and all get the result', async () => {
    const { fw, pool, client } = setup();
    const out = await Promise.all(Array.from({ length: 10 }, () => client.compute({ key: 'a', v: 1 })));
    expect(out.every((o) => o.v === 10)).toBe(true);
    expect(fw.ran).toHaveLength(1);
    expect(client.submitted).toBe(1);
    // A later call is answered from the finished results.
    expect(await client.compute({ key: 'a', v: 1 })).toBe(out[0]);
    expect(fw.ran).toHaveLength(1);
    pool.close();
  });

  test('a caller joining a running job sees its latest progress at once', async () => {
    const { pool, client } = setup();
    const first = client.compute({ key: 'p', v: 1, ms: 5, tail: 60 });
    await wait(30);
    const stages: string[] = [];
    const second = client.compute({ key: 'p', v: 1 }, { onProgress: (p) => stages.push(p.stage) });
    await Promise.all([first, second]);
    expect(stages).toEqual(['started']);
    pool.close();
  });

  test('a failed job is evicted: every waiting caller gets the error, and the next call computes again', async () => {
    const { fw, pool, client } = setup();
    const calls = [client.compute({ key: 'f', v: 2, fail: true }), client.compute({ key: 'f', v: 2, fail: true })];
    const errs = await Promise.all(calls.map((c) => c.catch((e) => e.message)));
    expect(errs).toEqual(['failed 2', 'failed 2']);
    expect(client.pending).toBe(0);
    expect(client.size).toBe(0);
    await client.compute({ key: 'f', v: 2, fail: true }).catch(() => undefined);
    expect(fw.ran).toHaveLength(2);
    pool.close();
  });

  test('one caller cancelling leaves the shared job running for the others', async () => {
    const { fw, pool, client } = setup();
    const a = new AbortController();
    const p1 = client.compute({ key: 's', v: 3, ms: 60 }, { signal: a.signal });
    const p2 = client.compute({ key: 's', v: 3, ms: 60 });
    a.abort();
    expect((await p1.catch((e) => e)).code).toBe('cancelled');
    expect((await p2).v).toBe(30);
    expect(fw.terminated).toBe(0);
    pool.close();
  });

  test('when the last caller cancels, the job is cancelled (its worker terminated) and evicted', async () => {
    const { fw, pool, client } = setup(1);
    const a = new AbortController(), b = new AbortController();
    const p1 = client.compute({ key: 'c', v: 4, ms: 10_000 }, { signal: a.signal });
    const p2 = client.compute({ key: 'c', v: 4, ms: 10_000 }, { signal: b.signal });
    await wait(5);
    a.abort(); b.abort();
    expect((await p1.catch((e) => e)).code).toBe('cancelled');
    expect((await p2.catch((e) => e)).code).toBe('cancelled');
    await wait(5);
    expect(fw.terminated).toBe(1);
    expect(pool.stats.jobsCancelled).toBe(1);
    expect(client.pending).toBe(0);
    // The same request computes afresh on the replacement worker.
    expect((await client.compute({ key: 'c', v: 4, ms: 5 })).v).toBe(40);
    expect(fw.started).toBe(2);
    pool.close();
  });

  test('a replacement call arriving right after its predecessor was cancelled takes the job over', async () => {
    const { fw, pool, client } = setup(1);
    const a = new AbortController();
    const old = client.compute({ key: 'r', v: 5, ms: 40 }, { signal: a.signal });
    a.abort();
    const replacement = client.compute({ key: 'r', v: 5, ms: 40 });
    expect((await old.catch((e) => e)).code).toBe('cancelled');
    expect((await replacement).v).toBe(50);
    expect(fw.terminated).toBe(0);
    expect(fw.ran).toHaveLength(1);
    pool.close();
  });

  test('an already aborted signal is refused without starting a job', async () => {
    const { fw, pool, client } = setup();
    const a = new AbortController();
    a.abort();
    expect((await client.compute({ key: 'z', v: 1 }, { signal: a.signal }).catch((e) => e)).code).toBe('cancelled');
    expect(fw.started).toBe(0);
    pool.close();
  });

  test('finished results are kept least-recently-used, up to the capacity', async () => {
    const { fw, pool, client } = setup();
    for (const k of ['k1', 'k2', 'k3']) await client.compute({ key: k, v: 1 });
    await client.compute({ key: 'k1', v: 1 }); // k1 becomes the most recent
    await client.compute({ key: 'k4', v: 1 }); // evicts k2
    expect(client.size).toBe(3);
    const before = fw.ran.length;
    await client.compute({ key: 'k1', v: 1 });
    expect(fw.ran.length).toBe(before);
    await client.compute({ key: 'k2', v: 1 });
    expect(fw.ran.length).toBe(before + 1);
    pool.close();
  });
});
