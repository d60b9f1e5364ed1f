/**
 * How an analysis declares its options: once, as data. The engine's resolver
 * ({@link resolveOptions}) validates requests against these declarations, and
 * every front (worksheet settings and tooltips, CLI flags and help, the pane's
 * controls, the README's option tables) is generated from them, so adding a
 * method touches only its own file and one registration line.
 */

/** A value an option can take once resolved. */
export type OptionValue = number | string | boolean | readonly [number, number];

/** Resolved options of one request: every declared option that was given or has a default. */
export type ResolvedOptions = Readonly<Record<string, OptionValue>>;

/** One declared option. */
export interface OptionDeclaration {
  /** The key in a request's options (camelCase). Fronts derive their spellings: `--shortest-segment`, `shortest-segment=5`. */
  name: string;
  /**
   * - `number`: a finite number within [min, max] (or above `above`);
   * - `integer`: a whole number within [min, max];
   * - `choice`: one of `choices` (case-insensitive);
   * - `switch`: true or false (TRUE/FALSE, yes/no, 1/0 as text);
   * - `range`: two numbers [low, high] with min <= low < high <= max.
   */
  kind: 'number' | 'integer' | 'choice' | 'switch' | 'range';
  /** One line of plain-language help, shown by every front. */
  help: string;
  /** Smallest allowed value (inclusive). */
  min?: number;
  /** Largest allowed value (inclusive). */
  max?: number;
  /** Exclusive lower bound (a value must be greater). */
  above?: number;
  /** Allowed values of a `choice`. */
  choices?: readonly string[];
  /** A plain-language line per choice, for help texts and the pane. */
  choiceHelp?: Readonly<Record<string, string>>;
  /** The value when the option is not given; none means "not set" (the method decides, as its help says). */
  default?: OptionValue;
  /** Earlier spellings of the option's name, still accepted with a note. */
  oldNames?: readonly string[];
  /** Earlier spellings of choice values, mapped to the current ones, still accepted with a note. */
  oldValues?: Readonly<Record<string, string>>;
  /** The option means something only when another option has one of these values (else it is refused). */
  onlyWith?: { option: string; values: readonly OptionValue[] };
  /** Options of one group are alternatives: at most one of them may be given. */
  group?: string;
  /** For a `number` option: text naming one of these values of another option is moved there (e.g. penalty "bic" -> rule "bic"). */
  textGoesTo?: string;
  /** The value meant when the option is named without one (a command-line flag alone). */
  implied?: OptionValue;
}

/** A progress report: how far, and what is being done, in plain words. */
export interface Progress {
  /** From 0 to 1. */
  fraction: number;
  stage: string;
}

/** What a caller passes to follow or stop a long analysis. */
export interface RunControl {
  /** Called at grid points, folds and batches of iterations (at most every 50 ms). */
  onProgress?: (p: Progress) => void;
  /** Checked at the same places; when `aborted` becomes true the analysis stops with a `cancelled` error. An AbortSignal fits. */
  signal?: { readonly aborted: boolean };
}
