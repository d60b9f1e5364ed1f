/**
 * The one resolver: a request's options checked against an analysis's
 * declarations, with defaults filled in. Strict with parameters: an unknown
 * option, a value out of range, an option that does not apply under the other
 * choices, or two alternatives given together are refused with a message that
 * names the option, prints the offending value and lists what is accepted.
 *
 * Spellings are forgiving: option names match case-insensitively and without
 * regard to '-', '_' or spaces (`shortest-segment`, `shortestSegment`,
 * `SHORTEST_SEGMENT`); numbers may arrive as text ("2", " 1e3 ") from cells and
 * command lines; switches as TRUE/FALSE, yes/no or 1/0. Old spellings of names
 * and values are accepted with a note.
 */
import { unmetCondition } from './unmetCondition';
import { KnotwiseError } from '../errors';
import { numberFromText } from '../numberText';
import { describeValue } from '../options';
import { Warning, warning } from '../warnings';
import type { OptionDeclaration, OptionValue, ResolvedOptions } from './optionDeclaration';

/** A name reduced for matching: lower case, letters and digits only. */
export function optionKey(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]/g, '');
}

/** The declarations by every name they accept ({@link optionKey} of the name and of its old names). Unchecked. */
export function declarationsByKey(declarations: readonly OptionDeclaration[]): Map<string, OptionDeclaration> {
  const byKey = new Map<string, OptionDeclaration>();
  for (const d of declarations) {
    byKey.set(optionKey(d.name), d);
    for (const o of d.oldNames ?? []) byKey.set(optionKey(o), d);
  }
  return byKey;
}

/** A declared name as a command-line flag or settings word: `shortestSegment` -> `shortest-segment`. */
export function dashedName(name: string): string {
  return name.replace(/([a-z0-9])([A-Z])/g, '$1-$2').toLowerCase();
}

/** What {@link resolveOptions} returns. */
export interface Resolution {
  options: ResolvedOptions;
  /** Notes on old spellings accepted. */
  notes: Warning[];
  /** The names (declared) the request gave explicitly. */
  given: string[];
}

const show = describeValue;

function toNumber(v: unknown): number | undefined {
  if (typeof v === 'number') return v;
  if (typeof v === 'string') return numberFromText(v.trim());
  return undefined;
}

function bounds(d: OptionDeclaration): string {
  const lo = d.above !== undefined ? `greater than ${d.above}` : d.min !== undefined ? `from ${d.min}` : '';
  const hi = d.max !== undefined ? `${lo ? ' ' : ''}${d.above !== undefined ? 'and at most' : 'to'} ${d.max}` : '';
  return lo || hi ? ` ${lo}${hi}` : '';
}

function checkValue(d: OptionDeclaration, raw: unknown, owner: string, notes: Warning[]): OptionValue {
  const where = `${dashedName(d.name)} (${owner})`;
  switch (d.kind) {
    case 'number':
    case 'integer': {
      const v = toNumber(raw);
      const whole = d.kind === 'integer';
      const ok = v !== undefined && Number.isFinite(v) && (!whole || Number.isInteger(v))
        && (d.min === undefined || v >= d.min) && (d.max === undefined || v <= d.max) && (d.above === undefined || v > d.above);
      if (!ok) throw new KnotwiseError('bad-option', `${where} must be a ${whole ? 'whole number' : 'number'}${bounds(d)}; got ${show(raw)}.`);
      return v as number;
    }
    case 'switch': {
      if (typeof raw === 'boolean') return raw;
      if (raw === 1 || raw === 0) return raw === 1;
      const t = typeof raw === 'string' ? raw.trim().toLowerCase() : '';
      if (['true', 'yes', '1', 'on'].includes(t)) return true;
      if (['false', 'no', '0', 'off'].includes(t)) return false;
      throw new KnotwiseError('bad-option', `${where} must be TRUE or FALSE; got ${show(raw)}.`);
    }
    case 'choice': {
      const t = typeof raw === 'string' ? raw.trim().toLowerCase() : typeof raw === 'number' ? String(raw) : undefined;
      const choices = d.choices ?? [];
      if (t !== undefined) {
        const hit = choices.find((c) => c === t);
        if (hit) return hit;
        const renamed = d.oldValues?.[t];
        if (renamed) {
          notes.push(warning('note', `"${t}" is now called "${renamed}" (${dashedName(d.name)}); the old spelling is still accepted for now.`));
          return renamed;
        }
      }
      throw new KnotwiseError('bad-option', `${where} must be one of ${choices.map((c) => `"${c}"`).join(', ')}; got ${show(raw)}.`);
    }
    case 'range': {
      const a = Array.isArray(raw) ? raw : typeof raw === 'string' ? raw.split(/[,;:]|\.\.|\s+to\s+/) : [];
      const lo = toNumber(a[0]), hi = toNumber(a[1]);
      const ok = a.length === 2 && lo !== undefined && hi !== undefined && Number.isFinite(lo) && Number.isFinite(hi) && lo < hi
        && (d.min === undefined || lo >= d.min) && (d.max === undefined || hi <= d.max);
      if (!ok) throw new KnotwiseError('bad-option', `${where} must be two numbers low, high with low < high${bounds(d)}; got ${show(raw)}.`);
      return [lo as number, hi as number];
    }
  }
}

/**
 * Checks `raw` against the declarations and fills defaults.
 *
 * @param declarations - the analysis's declared options
 * @param raw - the request's options as typed by the user (keys in any spelling; values possibly text)
 * @param owner - the analysis's name, for messages
 * @throws {@link KnotwiseError} `bad-option` for unknown options, bad values, options that do not apply, alternatives given together
 * @example
 * ```ts
 * resolveOptions(trendAnalysis.options, { ORDER: '2', rule: 'cv', folds: 10 }, 'trend').options; // { order: 2, rule: 'cv', folds: 10, ... }
 * ```
 */
export function resolveOptions(declarations: readonly OptionDeclaration[], raw: Readonly<Record<string, unknown>> | null | undefined, owner: string): Resolution {
  if (raw !== undefined && raw !== null && (typeof raw !== 'object' || Array.isArray(raw))) {
    throw new KnotwiseError('bad-option', `options must be a set of name = value pairs; got ${show(raw)}.`);
  }
  const byKey = declarationsByKey(declarations);
  const notes: Warning[] = [];
  const given = new Map<string, unknown>();
  for (const [key, value] of Object.entries(raw ?? {})) {
    if (value === undefined || value === null || value === '') continue;
    const d = byKey.get(optionKey(key));
    if (!d) {
      const list = declarations.map((x) => dashedName(x.name)).join(', ');
      throw new KnotwiseError('bad-option', `unknown option "${key}" for ${owner}; ${owner} accepts: ${list || 'no options'}.`);
    }
    if (optionKey(key) !== optionKey(d.name)) notes.push(warning('note', `option "${key}" is now called "${dashedName(d.name)}"; the old name is still accepted for now.`));
    if (given.has(d.name)) throw new KnotwiseError('bad-option', `${dashedName(d.name)} was given twice (${show(given.get(d.name))} and ${show(value)}); give it once.`);
    given.set(d.name, value);
  }
  // text in a number option that names another option's value (penalty "bic" -> rule "bic")
  for (const d of declarations) {
    if (!d.textGoesTo || !given.has(d.name)) continue;
    const v = given.get(d.name);
    if (typeof v === 'string' && toNumber(v) === undefined) {
      const target = declarations.find((x) => x.name === d.textGoesTo);
      if (target && !given.has(target.name)) { given.delete(d.name); given.set(target.name, v); }
    }
  }
  const out: Record<string, OptionValue> = {};
  for (const d of declarations) if (given.has(d.name)) out[d.name] = checkValue(d, given.get(d.name), owner, notes);
  // alternatives: at most one per group
  const groups = new Map<string, string[]>();
  for (const d of declarations) if (d.group && given.has(d.name)) groups.set(d.group, [...(groups.get(d.group) ?? []), d.name]);
  for (const names of groups.values()) {
    if (names.length > 1) {
      throw new KnotwiseError('bad-option', `give only one of ${names.map(dashedName).join(' or ')} (they are alternative ways to set the ${declarations.find((d) => d.name === names[0])!.group}); got ${names.map((n) => `${dashedName(n)} ${show(given.get(n))}`).join(' and ')}.`);
    }
  }
  // defaults, except for an alternative whose group already has a given member
  for (const d of declarations) {
    if (d.name in out || d.default === undefined) continue;
    if (d.group && groups.has(d.group)) continue;
    out[d.name] = d.default;
  }
  // options that apply only under another option's values, up the chain of conditions (unmetCondition)
  const values = (d: OptionDeclaration) => d.onlyWith!.values.map((v) => `"${v}"`).join(' or ');
  for (const d of declarations) {
    if (!d.onlyWith || !given.has(d.name)) continue;
    const miss = unmetCondition(declarations, d.name, (k) => out[k]);
    if (!miss) continue;
    const last = miss.chain[miss.chain.length - 1].onlyWith!.option;
    const conditions = miss.chain.map((t, i) => `${dashedName(t.name)}${i === 0 ? ' applies' : ''} only when ${dashedName(t.onlyWith!.option)} is ${values(t)}`).join(', and ');
    const found = miss.chain.length === 1 && miss.value === undefined ? ` (${dashedName(last)} is not set)` : `; ${dashedName(last)} is ${miss.value === undefined ? 'not set' : `"${String(miss.value)}"`}`;
    throw new KnotwiseError('bad-option', `${conditions}${found}. Remove ${dashedName(d.name)} or change ${dashedName(last)}.`);
  }
  return { options: out, notes, given: [...given.keys()] };
}
