/**
 * A small pool of workers, each running one job at a time, with a job id per
 * call and the job's resolve / reject kept on the calling side. Host-neutral:
 * a factory makes the workers (browser Web Workers, Node worker threads, or a
 * test double).
 *
 * Cancel: a queued job is dropped; a running job's worker is terminated (a
 * synchronous computation reads no messages, so asking it to stop would wait
 * for the end) and a replacement is started at once. With `spares` = 1 the
 * pool keeps one loaded worker in reserve that takes the terminated one's
 * place at once (loading a worker costs from about a hundred milliseconds in a
 * browser to about a second in a busy Node process), and a new reserve loads
 * in the background. A worker that fails (its script does not load, it runs
 * out of memory) rejects its job and is replaced on the next job.
 */
import type { Progress } from './engineEntry';
import { cancelledError } from './engineEntry';
import { RunMessage, WorkerMessage, errorFromWire } from './protocol';

/** What the pool needs from a worker. */
export interface WorkerLike {
  postMessage(message: unknown): void;
  terminate(): unknown;
}

/** Makes one worker that calls `onMessage` with each message it posts and `onFailure` when it dies. */
export type WorkerFactory = (onMessage: (m: WorkerMessage<unknown>) => void, onFailure: (e: Error) => void) => WorkerLike;

/** A submitted job. */
export interface JobHandle<Res> {
  readonly id: number;
  readonly promise: Promise<Res>;
  /** Stops the job: its promise rejects with a KnotwiseError of code 'cancelled'. No effect once settled. */
  cancel(): void;
}

interface Job<Req, Res> {
  id: number;
  request: Req;
  onProgress?: (p: Progress) => void;
  resolve(v: Res): void;
  reject(e: unknown): void;
  settled: boolean;
}

interface Slot<Req, Res> {
  worker: WorkerLike | null;
  ready: boolean;
  job: Job<Req, Res> | null;
  /** Generation: messages from a terminated worker are ignored. */
  generation: number;
}

/** Counters for tests and benchmarks. */
export interface PoolStats {
  workersStarted: number;
  workersTerminated: number;
  jobsRun: number;
  jobsCancelled: number;
}

export class WorkerPool<Req, Res> {
  private readonly slots: Slot<Req, Res>[] = [];
  private readonly queue: Job<Req, Res>[] = [];
  private nextId = 1;
  private closed = false;
  readonly stats: PoolStats = { workersStarted: 0, workersTerminated: 0, jobsRun: 0, jobsCancelled: 0 };
  private readyWaiters: (() => void)[] = [];
  /** Loaded workers held in reserve for replacing a cancelled job's worker. */
  private readonly reserve: Slot<Req, Res>[] = [];

  constructor(private readonly factory: WorkerFactory, readonly size: number, readonly spares = 0) {
    if (!(Number.isInteger(size) && size >= 1)) throw new RangeError(`pool size must be a whole number >= 1; got ${size}.`);
    if (!(Number.isInteger(spares) && spares >= 0)) throw new RangeError(`spares must be a whole number >= 0; got ${spares}.`);
    for (let i = 0; i < size; i++) this.slots.push({ worker: null, ready: false, job: null, generation: 0 });
  }

  /** Submits a job; progress reports go to `onProgress`. */
  run(request: Req, onProgress?: (p: Progress) => void): JobHandle<Res> {
    if (this.closed) throw new Error('the worker pool is closed.');
    const id = this.nextId++;
    let job!: Job<Req, Res>;
    const promise = new Promise<Res>((resolve, reject) => {
      job = { id, request, onProgress, resolve, reject, settled: false };
    });
    this.queue.push(job);
    this.dispatch();
    this.fillReserve();
    return { id, promise, cancel: () => this.cancel(id) };
  }

  /** Cancels a queued or running job by id. */
  cancel(id: number): void {
    const q = this.queue.findIndex((j) => j.id === id);
    if (q >= 0) {
      const [job] = this.queue.splice(q, 1);
      this.stats.jobsCancelled++;
      this.settle(job, undefined, cancelledError());
      return;
    }
    const slot = this.slots.find((s) => s.job?.id === id);
    if (!slot) return;
    const job = slot.job!;
    slot.job = null;
    this.stats.jobsCancelled++;
    this.settle(job, undefined, cancelledError()); // the caller is released first
    this.retire(slot);
    this.replace(slot);
    this.dispatch();
  }

  /** Jobs running now. */
  get running(): number {
    return this.slots.filter((s) => s.job !== null).length;
  }

  /** Jobs waiting for a worker. */
  get queued(): number {
    return this.queue.length;
  }

  /** Workers alive now. */
  get workers(): number {
    return this.slots.filter((s) => s.worker !== null).length;
  }

  /** Starts `count` workers now (default: all, and the reserve) instead of at the first job, so the first job does not wait for start-up. */
  warm(count = this.size): void {
    for (const s of this.slots.slice(0, count)) if (!s.worker) this.start(s);
    this.fillReserve();
  }

  /** Workers loaded and waiting in reserve. */
  get reserved(): number {
    return this.reserve.filter((r) => r.ready).length;
  }

  /** Resolves when every started worker has loaded its code and none is running a job. */
  whenIdle(): Promise<void> {
    if (this.isIdle()) return Promise.resolve();
    return new Promise((r) => this.readyWaiters.push(r));
  }

  /** Terminates every worker; pending jobs reject as cancelled. */
  close(): void {
    this.closed = true;
    for (const j of this.queue.splice(0)) this.settle(j, undefined, cancelledError());
    for (const s of this.slots) {
      const j = s.job;
      s.job = null;
      this.retire(s);
      if (j) this.settle(j, undefined, cancelledError());
    }
    for (const r of this.reserve.splice(0)) this.retire(r);
  }

  /** Gives a slot whose worker was terminated a loaded reserve worker, or a new one. */
  private replace(slot: Slot<Req, Res>): void {
    const k = this.reserve.findIndex((r) => r.ready);
    if (k < 0) { this.start(slot); this.fillReserve(); return; }
    const [spare] = this.reserve.splice(k, 1);
    // The reserve worker's callbacks check its own slot's generation: keep that slot object, hand its state over.
    const i = this.slots.indexOf(slot);
    this.slots[i] = spare;
    this.fillReserve();
  }

  private fillReserve(): void {
    while (!this.closed && this.reserve.length < this.spares) {
      const r: Slot<Req, Res> = { worker: null, ready: false, job: null, generation: 0 };
      this.reserve.push(r);
      this.start(r);
    }
  }

  private isIdle(): boolean {
    return this.queue.length === 0 && this.slots.every((s) => s.job === null && (s.worker === null || s.ready));
  }

  private notifyIdle(): void {
    if (this.readyWaiters.length && this.isIdle()) for (const r of this.readyWaiters.splice(0)) r();
  }

  private start(slot: Slot<Req, Res>): void {
    if (this.closed) return;
    const generation = ++slot.generation;
    slot.ready = false;
    this.stats.workersStarted++;
    slot.worker = this.factory(
      (m) => { if (slot.generation === generation) this.onMessage(slot, m as WorkerMessage<Res>); },
      (e) => { if (slot.generation === generation) this.onFailure(slot, e); },
    );
  }

  private retire(slot: Slot<Req, Res>): void {
    slot.generation++;
    if (slot.worker) {
      this.stats.workersTerminated++;
      try { slot.worker.terminate(); } catch { /* already gone */ }
    }
    slot.worker = null;
    slot.ready = false;
  }

  private dispatch(): void {
    for (const slot of this.slots) {
      if (!this.queue.length) break;
      if (slot.job) continue;
      if (!slot.worker) this.start(slot);
      const job = this.queue.shift()!;
      slot.job = job;
      this.stats.jobsRun++;
      const msg: RunMessage<Req> = { type: 'run', id: job.id, request: job.request };
      try {
        slot.worker!.postMessage(msg);
      } catch (e) {
        slot.job = null;
        this.settle(job, undefined, e);
      }
    }
    this.notifyIdle();
  }

  private onMessage(slot: Slot<Req, Res>, m: WorkerMessage<Res>): void {
    if (m.type === 'ready') { slot.ready = true; this.notifyIdle(); return; }
    const job = slot.job;
    if (!job || job.id !== m.id) return;
    slot.ready = true;
    if (m.type === 'progress') {
      try { job.onProgress?.(m.progress); } catch { /* a listener's failure is not the job's */ }
      return;
    }
    slot.job = null;
    if (m.type === 'result') this.settle(job, m.result, undefined);
    else this.settle(job, undefined, errorFromWire(m.error));
    this.dispatch();
  }

  private onFailure(slot: Slot<Req, Res>, e: Error): void {
    const r = this.reserve.indexOf(slot);
    if (r >= 0) { this.reserve.splice(r, 1); this.retire(slot); return; } // not refilled here, so a worker that cannot load does not loop
    const job = slot.job;
    slot.job = null;
    this.retire(slot);
    if (job) this.settle(job, undefined, new Error(`the worker stopped: ${e.message}`));
    this.dispatch();
  }

  private settle(job: Job<Req, Res>, value: Res | undefined, error: unknown): void {
    if (job.settled) return;
    job.settled = true;
    if (error !== undefined) job.reject(error);
    else job.resolve(value as Res);
  }
}

/** Pool size for a machine with `cores` logical processors: one per core, at least 1, at most 4. */
export function poolSize(cores: number | undefined): number {
  const c = Number.isFinite(cores) ? Math.floor(cores as number) : 1;
  return Math.max(1, Math.min(4, c));
}
