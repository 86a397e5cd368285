// Cells of the CSV files Sunreckon writes and reads (the loads list, the hourly forecast): the
// formula-injection rule both exports share. Pure.

// A spreadsheet runs a cell that starts with one of these as a formula (CSV injection). Export puts
// an apostrophe in front; import takes one off again. Leading apostrophes count, so a name that
// really starts with "'=" survives the round trip. Plain numbers such as -5 are left alone.
const FORMULA_START = /^'*[=+\-@\t\r]/;
const PLAIN_NUMBER = /^-?\d+(\.\d+)?([eE][+-]?\d+)?$/;

/** Whether an exported cell needs the apostrophe that stops a spreadsheet running it as a formula. */
export function needsFormulaEscape(cell: string): boolean {
  return FORMULA_START.test(cell) && !PLAIN_NUMBER.test(cell);
}

/** Takes off the apostrophe that export put in front of a formula-like cell. */
export function unescapeCell(cell: string): string {
  return cell.startsWith("'") && FORMULA_START.test(cell.slice(1)) ? cell.slice(1) : cell;
}
