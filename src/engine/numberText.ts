/**
 * Plain decimal numbers written as text ("12", "-3.5", "1e-4"): the one rule
 * every front uses to tell a number typed as text from other text. No
 * thousands separators, currency signs or spaces inside; those stay text.
 */
const DECIMAL = /^[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?$/;

/** The number a text spells (after trimming), or undefined when it is not a plain decimal. */
export function numberFromText(text: string): number | undefined {
  const t = text.trim();
  return DECIMAL.test(t) ? Number(t) : undefined;
}
