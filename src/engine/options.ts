/**
 * Parameter checks shared by the methods: strict, with messages that print the
 * offending value and the allowed range.
 */
import { KnotwiseError, showNumber } from './errors';

/** A finite number >= 0 (a penalty). */
export function checkPenalty(v: unknown, name = 'penalty'): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v < 0) {
    throw new KnotwiseError('bad-option', `${name} must be a finite number >= 0; got ${describe(v)}.`);
  }
  return v;
}

/** A finite number > 0. */
export function checkPositive(v: unknown, name: string): number {
  if (typeof v !== 'number' || !Number.isFinite(v) || v <= 0) {
    throw new KnotwiseError('bad-option', `${name} must be a finite number > 0; got ${describe(v)}.`);
  }
  return v;
}

/** An integer in [lo, hi]. */
export function checkInteger(v: unknown, name: string, lo: number, hi: number): number {
  if (typeof v !== 'number' || !Number.isInteger(v) || v < lo || v > hi) {
    throw new KnotwiseError('bad-option', `${name} must be a whole number from ${lo} to ${hi}; got ${describe(v)}.`);
  }
  return v;
}

/** One of a list of names (case-insensitive); returns the canonical name. */
export function checkChoice<T extends string>(v: unknown, name: string, allowed: readonly T[]): T {
  const s = typeof v === 'string' ? v.trim().toLowerCase() : undefined;
  const hit = allowed.find((a) => a === s);
  if (!hit) throw new KnotwiseError('bad-option', `${name} must be one of ${allowed.map((a) => `"${a}"`).join(', ')}; got ${describe(v)}.`);
  return hit;
}


/** An option value as printed in messages: numbers short, text quoted, arrays bracketed. */
export function describeValue(v: unknown): string {
  if (typeof v === 'number') return showNumber(v);
  if (typeof v === 'string') return `"${v}"`;
  if (Array.isArray(v)) return `[${v.map(describeValue).join(', ')}]`;
  return String(v);
}

const describe = describeValue;
