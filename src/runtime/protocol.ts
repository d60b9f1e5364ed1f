/**
 * The messages between a page (or the command line) and its workers. One job
 * per message: the caller posts `run` with a job id; the worker answers with
 * any number of `progress` messages, then one `result` or one `error`. A
 * worker announces itself with `ready` once its code is loaded.
 *
 * Errors cross as plain {code, message} (structured clone keeps neither the
 * class nor extra fields of an Error) and are rebuilt on the other side: a
 * KnotwiseError stays a KnotwiseError with its code.
 *
 * Written out rather than built on comlink (4.4): the protocol is one message
 * in and a few out; comlink's error transfer keeps only message, name and
 * stack (the code would be lost without a custom handler), a call pending on a
 * terminated worker never settles (the pool has to keep every job's resolve
 * and reject anyway, to cancel by terminating), and a progress callback would
 * need a proxy with its own message channel per call.
 */
import { ErrorCode, KnotwiseError } from '../engine/errors';
import type { Progress } from './engineEntry';

export interface RunMessage<Req> { type: 'run'; id: number; request: Req }
export type WorkerMessage<Res> =
  | { type: 'ready' }
  | { type: 'progress'; id: number; progress: Progress }
  | { type: 'result'; id: number; result: Res }
  | { type: 'error'; id: number; error: WireError };

/** An error as it crosses a thread boundary. */
export interface WireError {
  /** The KnotwiseError code, or 'unexpected' for anything else. */
  code: string;
  message: string;
  knotwise: boolean;
}

/** Flattens a thrown value for posting. */
export function errorToWire(e: unknown): WireError {
  if (typeof e === 'object' && e !== null && (e as { name?: unknown }).name === 'KnotwiseError') {
    return { code: String((e as KnotwiseError).code), message: String((e as KnotwiseError).message), knotwise: true };
  }
  return { code: 'unexpected', message: e instanceof Error ? e.message : String(e), knotwise: false };
}

/** Rebuilds a posted error: a KnotwiseError with its code, or a plain Error. */
export function errorFromWire(w: WireError): Error {
  if (w.knotwise) return new KnotwiseError(w.code as ErrorCode, w.message);
  return new Error(w.message);
}
