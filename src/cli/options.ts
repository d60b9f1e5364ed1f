/**
 * The command line's options: one table that drives both parsing and the
 * help text, so the two cannot drift apart.
 */
export interface OptionSpec {
  flag: string;
  /** Name of the value, or undefined for a switch. */
  value?: string;
  help: string;
  /** May be given more than once (values accumulate; commas also separate). */
  repeatable?: boolean;
  /** The value may be left out (`--flag` alone means this value; `--flag=V` sets it). */
  implied?: string;
}

export interface CommandSpec {
  name: string;
  usage: string;
  summary: string;
  options: OptionSpec[];
}

const common: OptionSpec[] = [
  { flag: '--x', value: 'COL', help: 'column of positions (header name or 1-based number); default: row numbers 1..n' },
  { flag: '--y', value: 'COL', help: 'column(s) of values; several columns give one result each; default: the last column', repeatable: true },
  { flag: '--w', value: 'COL', help: 'column of positive weights' },
  { flag: '--json', help: 'print JSON (one object, or an array for several --y) instead of a text summary' },
];

export const FIT: CommandSpec = {
  name: 'fit',
  usage: 'knotwise fit <file.csv> [options]',
  summary: 'smooth a series: fitted values, penalty, df, knots and warnings',
  options: [
    ...common,
    { flag: '--method', value: 'NAME', help: '"spline" (default) or "trend"' },
    { flag: '--order', value: 'K', help: 'trend filtering order 0..3 (default 1)' },
    { flag: '--penalty', value: 'VALUE', help: 'fixed penalty lambda' },
    { flag: '--df', value: 'D', help: 'target equivalent degrees of freedom' },
    { flag: '--select', value: 'RULE', help: 'penalty rule: gcv | cv | cv-1se (spline); cv | cv-1se | sure | bic (trend)' },
    { flag: '--folds', value: 'K', help: 'cross-validation folds' },
    { flag: '--one-se', help: 'with cv: the largest penalty within one standard error of the best' },
    { flag: '--relaxed', value: 'R', implied: '1', help: 'trend: refit the pieces without shrinkage (--relaxed), or mix with --relaxed=R, R from 0 to 1' },
    { flag: '--eval', value: 'FILE', help: 'CSV of new x (column "x" or the first column): adds eval [{x, value, extrapolated}]' },
  ],
};

export const BREAKS: CommandSpec = {
  name: 'breaks',
  usage: 'knotwise breaks <file.csv> [options]',
  summary: 'find changepoints: breaks table, segments and the segmented fit',
  options: [
    ...common,
    { flag: '--model', value: 'NAME', help: 'mean (default) | meanvar | poisson | distribution | slope' },
    { flag: '--penalty', value: 'RULE', help: 'bic (default) | mbic | a number | crops:LOW,HIGH (all segmentations for penalties in that range)' },
    { flag: '--min-segment', value: 'M', help: 'fewest points per segment' },
    { flag: '--sigma', value: 'S', help: 'known noise standard deviation (mean and slope models)' },
  ],
};

export const COMMANDS = [FIT, BREAKS];

/** The help text, generated from the tables above. */
export function helpText(): string {
  const lines = ['knotwise: smoothing, knots and changepoints for series in CSV files', ''];
  for (const c of COMMANDS) {
    lines.push(`${c.usage}`, `  ${c.summary}`);
    for (const o of c.options) lines.push(`  ${(o.flag + (o.value ? (o.implied !== undefined ? `[=${o.value}]` : ' ' + o.value) : '')).padEnd(22)} ${o.help}`);
    lines.push('');
  }
  lines.push('Rows in the output are numbered as data rows of the file (1 = the first row after the header).');
  lines.push('Exit codes: 0 done; 1 the data or an option was refused (message on stderr); 2 usage error.');
  lines.push('A smoothed trend describes the past and is not a forecast; a statistical break is not proof of its cause.');
  return lines.join('\n');
}

export type Parsed = { positional: string[]; values: Map<string, string[]>; switches: Set<string> };

/** Parses argv against a command's table; unknown flags are usage errors. */
export function parseArgs(argv: string[], spec: CommandSpec, fail: (m: string) => never): Parsed {
  const out: Parsed = { positional: [], values: new Map(), switches: new Set() };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    if (!a.startsWith('--')) { out.positional.push(a); continue; }
    const [flag, inline] = a.includes('=') ? [a.slice(0, a.indexOf('=')), a.slice(a.indexOf('=') + 1)] : [a, undefined];
    const o = spec.options.find((s) => s.flag === flag);
    if (!o) fail(`unknown option ${flag} for "${spec.name}"; see knotwise help.`);
    if (!o.value) { out.switches.add(flag); continue; }
    const v = inline ?? (o.implied !== undefined ? o.implied : argv[++i]);
    if (v === undefined) fail(`${flag} needs a value (${o.value}).`);
    const prev = out.values.get(flag) ?? [];
    if (prev.length && !o.repeatable) fail(`${flag} given twice.`);
    out.values.set(flag, [...prev, ...(o.repeatable ? v.split(',') : [v])]);
  }
  return out;
}
