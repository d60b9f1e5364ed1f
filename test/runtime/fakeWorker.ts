/**
 * An in-process stand-in for a worker: runs the real job loop (serveJobs) on
 * a timer, passes every message through structuredClone as a thread boundary
 * would, and drops everything once terminated. `delay` (ms) is how long each
 * job waits before its function runs, `answerDelay` how long after that its
 * result or error arrives (progress arrives at once).
 */
import type { WorkerFactory } from '../../src/runtime/pool';
import type { RunControl } from '../../src/runtime/engineEntry';
import { serveJobs } from '../../src/runtime/serveJobs';

export interface FakeWorkers {
  factory: WorkerFactory;
  started: number;
  terminated: number;
  /** Jobs whose run function was entered. */
  ran: unknown[];
}

export function fakeWorkers(run: (request: any, control: RunControl) => unknown, delay = (_r: any) => 10, answerDelay = (_r: any) => 0): FakeWorkers {
  const state: FakeWorkers = { factory: null as unknown as WorkerFactory, started: 0, terminated: 0, ran: [] };
  state.factory = (onMessage) => {
    state.started++;
    let alive = true;
    const timers = new Set<ReturnType<typeof setTimeout>>();
    const later = (ms: number, f: () => void) => { const t = setTimeout(() => { timers.delete(t); if (alive) f(); }, ms); timers.add(t); };
    let current: unknown;
    const handle = serveJobs((r: any, c) => { current = r; state.ran.push(r); return run(r, c); }, (m) => {
      const copy = structuredClone(m);
      later(m.type === 'result' || m.type === 'error' ? answerDelay(current) : 0, () => onMessage(copy));
    });
    later(0, () => onMessage({ type: 'ready' }));
    return {
      postMessage: (m: any) => { const copy = structuredClone(m); later(delay(copy.request), () => handle(copy)); },
      terminate: () => { alive = false; state.terminated++; for (const t of timers) clearTimeout(t); timers.clear(); },
    };
  };
  return state;
}
