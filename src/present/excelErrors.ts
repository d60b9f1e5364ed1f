/**
 * Excel's error values as text: how a worksheet saved as CSV writes them, how
 * Office.js reports an error cell's value (with the value type "Error"), and
 * what typing one into a cell produces (Excel turns the typed literal into the
 * error value itself). Fronts use it to pass such cells on as error cells.
 */
export const EXCEL_ERROR_LITERALS: ReadonlySet<string> = new Set([
  '#NULL!', '#DIV/0!', '#VALUE!', '#REF!', '#NAME?', '#NUM!', '#N/A', '#GETTING_DATA',
  '#SPILL!', '#CALC!', '#FIELD!', '#BUSY!', '#BLOCKED!', '#CONNECT!', '#UNKNOWN!',
]);

/** The error cell a literal stands for, or undefined when the text is not one of Excel's error values. */
export function excelErrorCell(text: string): { error: string } | undefined {
  const t = text.trim().toUpperCase();
  return EXCEL_ERROR_LITERALS.has(t) ? { error: t } : undefined;
}
