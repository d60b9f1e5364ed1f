/**
 * The one call the fronts make: `compute(request, {onProgress, signal})`.
 *
 * A cache of promises keyed by the request's key sits in front of the pool:
 * calls with the same cells and options share one job even when they arrive
 * while it runs (ten worksheet functions over one range compute once), and
 * finished results stay in a small least-recently-used store. A failed or
 * cancelled job is evicted, so the next call computes afresh.
 *
 * Each caller has its own signal. Aborting it rejects that caller's promise at
 * once with a KnotwiseError of code 'cancelled'; the shared job stops only when
 * no caller is left waiting for it (checked after the current task, so a
 * replacement call that arrives just after its predecessor was cancelled, as
 * Excel may do on recalculation, takes the job over instead of restarting it).
 */
import type { Progress } from './engineEntry';
import { cancelledError } from './engineEntry';
import type { JobHandle } from './pool';

/** An AbortSignal, or anything with the same two members. */
export interface SignalLike {
  readonly aborted: boolean;
  addEventListener(type: 'abort', listener: () => void): void;
  removeEventListener?(type: 'abort', listener: () => void): void;
}

export interface ComputeOptions {
  onProgress?: (p: Progress) => void;
  signal?: SignalLike;
}

/** Submits one job: a WorkerPool's `run`, or an in-thread runner. */
export type Submit<Req, Res> = (request: Req, onProgress: (p: Progress) => void) => JobHandle<Res>;

interface Waiter<Res> {
  resolve(v: Res): void;
  reject(e: unknown): void;
  onProgress?: (p: Progress) => void;
}

interface Running<Res> {
  state: 'running';
  job: JobHandle<Res> | null;
  waiters: Set<Waiter<Res>>;
  last?: Progress;
}

interface Done<Res> {
  state: 'done';
  value: Res;
}

export class AnalysisClient<Req, Res> {
  private readonly running = new Map<string, Running<Res>>();
  private readonly done = new Map<string, Done<Res>>();
  /** Jobs submitted (cache misses). */
  submitted = 0;

  constructor(private readonly submit: Submit<Req, Res>, private readonly keyOf: (r: Req) => string, readonly capacity = 16) {}

  /** The result of `request`, computed once per key. */
  compute(request: Req, options: ComputeOptions = {}): Promise<Res> {
    const { signal, onProgress } = options;
    if (signal?.aborted) return Promise.reject(cancelledError());
    const key = this.keyOf(request);
    const hit = this.done.get(key);
    if (hit) {
      this.done.delete(key);
      this.done.set(key, hit);
      return Promise.resolve(hit.value);
    }
    let entry = this.running.get(key);
    if (!entry) entry = this.startJob(key, request);
    const e = entry;
    return new Promise<Res>((resolve, reject) => {
      const waiter: Waiter<Res> = { resolve, reject, onProgress };
      e.waiters.add(waiter);
      if (e.last && onProgress) onProgress(e.last);
      if (!signal) return;
      const onAbort = () => {
        if (!e.waiters.delete(waiter)) return;
        reject(cancelledError());
        if (e.waiters.size === 0) setTimeout(() => this.dropIfUnwanted(key, e), 0);
      };
      signal.addEventListener('abort', onAbort);
      const detach = () => signal.removeEventListener?.('abort', onAbort);
      waiter.resolve = (v) => { detach(); resolve(v); };
      waiter.reject = (err) => { detach(); reject(err); };
    });
  }

  /** Number of finished results held. */
  get size(): number {
    return this.done.size;
  }

  /** Number of jobs under way. */
  get pending(): number {
    return this.running.size;
  }

  /** Forgets finished results (jobs under way go on). */
  clear(): void {
    this.done.clear();
  }

  private startJob(key: string, request: Req): Running<Res> {
    const entry: Running<Res> = { state: 'running', job: null, waiters: new Set() };
    this.running.set(key, entry);
    this.submitted++;
    const job = this.submit(request, (p) => {
      entry.last = p;
      for (const w of entry.waiters) {
        try { w.onProgress?.(p); } catch { /* a listener's failure is not the job's */ }
      }
    });
    entry.job = job;
    job.promise.then(
      (value) => {
        if (this.running.get(key) === entry) this.running.delete(key);
        this.done.set(key, { state: 'done', value });
        while (this.done.size > this.capacity) this.done.delete(this.done.keys().next().value as string);
        for (const w of entry.waiters) w.resolve(value);
        entry.waiters.clear();
      },
      (err) => {
        if (this.running.get(key) === entry) this.running.delete(key);
        for (const w of entry.waiters) w.reject(err);
        entry.waiters.clear();
      },
    );
    return entry;
  }

  private dropIfUnwanted(key: string, entry: Running<Res>): void {
    if (entry.waiters.size > 0) return;
    if (this.running.get(key) === entry) this.running.delete(key);
    entry.job?.cancel();
  }
}
