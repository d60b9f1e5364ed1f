/**
 * The settings argument of the worksheet functions: one text of
 * `name=value` pairs separated by semicolons, e.g. "order=2; cv; folds=10",
 * so options need not be counted out with empty commas. A word alone is the
 * value of the one option whose choices include it ("cv", "mbic"); a number
 * alone is the penalty. Names and values are passed to the engine as typed:
 * its resolver checks them against the method's declared options and names
 * whatever it refuses.
 */
import { KnotwiseError, OptionDeclaration, numberFromText } from '../engine';

/**
 * Splits a settings cell into options for the engine.
 *
 * @param settings - the cell's value: text, a number (the penalty), or blank
 * @param declarations - the chosen method's declared options (to place lone words)
 * @example
 * ```ts
 * parseSettings('order=2; cv; folds=10', trendAnalysis.options); // { order: '2', rule: 'cv', folds: '10' }
 * ```
 */
export function parseSettings(settings: unknown, declarations: readonly OptionDeclaration[]): Record<string, unknown> {
  if (settings === undefined || settings === null || settings === '') return {};
  if (typeof settings === 'number') return { penalty: settings };
  if (typeof settings !== 'string') throw new KnotwiseError('bad-option', `settings must be text such as "order=2; folds=10"; got ${String(settings)}.`);
  const out: Record<string, unknown> = {};
  for (const part of settings.split(';').map((p) => p.trim()).filter((p) => p !== '')) {
    const eq = part.indexOf('=');
    if (eq >= 0) {
      const key = part.slice(0, eq).trim();
      if (key === '') throw new KnotwiseError('bad-option', `"${part}" in the settings "${settings}" has no name before "="; write it as name=value.`);
      out[key] = part.slice(eq + 1).trim();
      continue;
    }
    if (numberFromText(part) !== undefined) { out.penalty = part; continue; }
    const word = part.toLowerCase();
    const owners = declarations.filter((d) => d.kind === 'choice' && (d.choices?.includes(word) || (d.oldValues && word in d.oldValues)));
    if (owners.length !== 1) {
      const words = declarations.filter((d) => d.kind === 'choice').flatMap((d) => d.choices ?? []);
      throw new KnotwiseError('bad-option', `"${part}" in the settings "${settings}" is not a value this method knows on its own; write name=value (e.g. order=2) or one of: ${words.map((w) => `"${w}"`).join(', ')}.`);
    }
    out[owners[0].name] = word;
  }
  return out;
}
