/**
 * The command line's options: generated from the analyses' declared options,
 * so parsing and help cannot drift from what the engine accepts. A few flags
 * belong to the command line itself (columns, output, files).
 */
import { AnalysisFamily, DEFAULT_SMOOTHER, OptionDeclaration, analysisDefinitions, dashedName } from '../engine';

export interface OptionSpec {
  flag: string;
  /** Name of the value, or undefined for a switch. */
  value?: string;
  help: string;
  /** May be given more than once (values accumulate; commas also separate). */
  repeatable?: boolean;
  /** The value may be left out (`--flag` alone means this value; `--flag=V` sets it). */
  implied?: string;
  /** The declared engine option this flag sets (absent for the command line's own flags). */
  option?: string;
  /** Shown in help? (old spellings are accepted but not listed) */
  hidden?: boolean;
}

export interface CommandSpec {
  name: string;
  usage: string;
  summary: string;
  options: OptionSpec[];
}

const common: OptionSpec[] = [
  { flag: '--x', value: 'COL', help: 'column of positions (header name or 1-based number); ISO dates are read as dates; default: row numbers 1..n' },
  { flag: '--y', value: 'COL', help: 'column(s) of values; several columns give one result each; default: the last column', repeatable: true },
  { flag: '--w', value: 'COL', help: 'column of positive weights' },
  { flag: '--sheet', value: 'NAME', help: 'with an .xlsx file: the sheet to read (name or 1-based number); default: the first sheet' },
  { flag: '--json', help: 'print JSON (one object, or an array for several --y) instead of a text summary' },
  { flag: '--out', value: 'FILE', help: 'write the output (JSON or text) to FILE instead of the screen; an existing FILE is never replaced without --force' },
  { flag: '--force', help: 'with --out: replace FILE if it exists' },
  { flag: '--timing', help: 'print one line of times to stderr: reading the file, the engine (per column), writing, in ms, and the peak memory in MB' },
];

function valueName(d: OptionDeclaration): string {
  switch (d.kind) {
    case 'choice': return d.choices!.join('|').toUpperCase().length > 24 ? 'NAME' : d.choices!.join('|');
    case 'integer': return 'N';
    case 'range': return 'LOW,HIGH';
    default: return 'VALUE';
  }
}

/** One flag per declared option of the family's analyses, naming the analyses that accept it when not all do. */
function declaredFlags(family: AnalysisFamily): OptionSpec[] {
  const defs = analysisDefinitions(family);
  const byName = new Map<string, { d: OptionDeclaration; owners: string[]; all: OptionDeclaration[] }>();
  for (const def of defs) {
    for (const d of def.options) {
      const e = byName.get(d.name) ?? { d, owners: [], all: [] };
      e.owners.push(def.name);
      e.all.push(d);
      byName.set(d.name, e);
    }
  }
  const out: OptionSpec[] = [];
  for (const { d, owners, all } of byName.values()) {
    const only = owners.length < defs.length ? ` [${owners.join(', ')}]` : '';
    const implied = d.implied === undefined ? undefined : String(d.implied);
    // a flag the methods declare differently (the rule's values, the folds' default): one method's wording would
    // mislead for the others, so the line says what the flag is and where each method's values and default are
    const alike = all.every((x) => x.help === d.help && x.kind === d.kind && String(x.choices) === String(d.choices));
    const choices = [...new Set(all.flatMap((x) => x.choices ?? []))];
    const value = alike || d.kind !== 'choice' ? valueName(d) : valueName({ ...d, choices });
    // each meaning once (its first clause), with the methods that give it that meaning
    const meanings = new Map<string, string[]>();
    all.forEach((x, i) => { const m = x.help.split(/:| \(/)[0]; meanings.set(m, [...(meanings.get(m) ?? []), owners[i]]); });
    const help = alike ? d.help + only
      : meanings.size === 1 ? `${[...meanings.keys()][0]}; its values and default differ by method: knotwise help NAME${only}`
        : `${[...meanings].map(([m, o]) => `${m} [${o.join(', ')}]`).join('; ')}; values and defaults: knotwise help NAME`;
    out.push(d.kind === 'switch'
      ? { flag: `--${dashedName(d.name)}`, help, option: d.name }
      : { flag: `--${dashedName(d.name)}`, value, help, option: d.name, implied });
    for (const old of d.oldNames ?? []) {
      out.push({ flag: `--${dashedName(old)}`, value: valueName(d), help: `old name of --${dashedName(d.name)}`, option: old, implied, hidden: true });
    }
  }
  return out;
}

/** The commands, built from the registry (call after the engine is loaded). */
export function commands(): CommandSpec[] {
  const smoothers = analysisDefinitions('smoother').map((d) => d.name);
  const models = analysisDefinitions('changepoints').map((d) => d.name);
  const fit: CommandSpec = {
    name: 'fit',
    usage: 'knotwise fit <file.csv|file.xlsx> [options]',
    summary: 'smooth a series: fitted values, penalty, df, knots and warnings',
    options: [
      ...common,
      { flag: '--method', value: 'NAME', help: `${smoothers.join(' | ')} (default ${DEFAULT_SMOOTHER}: every method compared by cross-validation); knotwise help NAME lists its options` },
      ...declaredFlags('smoother'),
      { flag: '--one-se', help: 'old switch for --rule cv-simpler', hidden: true },
      { flag: '--eval', value: 'FILE', help: 'CSV of new x (column "x" or the first column): adds eval [{x, value, extrapolated}]' },
    ],
  };
  const breaks: CommandSpec = {
    name: 'breaks',
    usage: 'knotwise breaks <file.csv|file.xlsx> [options]',
    summary: 'find changepoints: breaks table, segments and the segmented fit',
    options: [
      ...common,
      { flag: '--model', value: 'NAME', help: `${models.join(' | ')} (default level); knotwise help NAME lists its options` },
      ...declaredFlags('changepoints'),
    ],
  };
  const decompose: CommandSpec = {
    name: 'decompose',
    usage: 'knotwise decompose <file.csv|file.xlsx> [options]',
    summary: 'take a series apart: trend, season, spikes and remainder per row, with the season found from dates',
    options: [...common, ...declaredFlags('decomposition')],
  };
  return [fit, breaks, decompose];
}

/** One help line: the flag in a column of 28, its help after it, or on the next line when the flag is longer. */
const helpLine = (flag: string, help: string): string => (flag.length < 28 ? `  ${flag.padEnd(28)} ${help}` : `  ${flag}\n  ${' '.repeat(28)} ${help}`);

/** The help text, generated from the command tables and, for one method, from its declarations. */
export function helpText(topic?: string): string {
  const lines = ['knotwise: smoothing, knots and changepoints for series in CSV files and .xlsx workbooks', ''];
  const defs = analysisDefinitions();
  const one = topic ? defs.find((d) => d.name === topic.toLowerCase()) : undefined;
  if (one) {
    lines.push(`${one.name}: ${one.label}`, `  ${one.summary}`, '');
    for (const d of one.options) {
      const flag = `--${dashedName(d.name)}` + (d.kind === 'switch' ? '' : ` ${valueName(d)}`);
      lines.push(helpLine(flag, `${d.help}${d.default !== undefined ? ` [default ${Array.isArray(d.default) ? d.default.join(',') : d.default}]` : ''}`));
      for (const [c, h] of Object.entries(d.choiceHelp ?? {})) lines.push(`      ${c.padEnd(12)} ${h}`);
    }
    return lines.join('\n');
  }
  for (const c of commands()) {
    lines.push(`${c.usage}`, `  ${c.summary}`);
    for (const o of c.options) if (!o.hidden) lines.push(helpLine(o.flag + (o.value ? (o.implied !== undefined ? `[=${o.value}]` : ' ' + o.value) : ''), o.help));
    lines.push('');
  }
  lines.push('Methods and models:');
  for (const d of defs) lines.push(`  ${d.name.padEnd(14)} ${d.label}`);
  lines.push('', 'knotwise help NAME shows one method\'s options with their defaults.');
  lines.push('Rows in the output are numbered as data rows of the file or sheet (1 = the first row after the header).');
  lines.push('In an .xlsx sheet, date cells are read as dates; text, booleans and error cells are left out and named, as on a worksheet.');
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
