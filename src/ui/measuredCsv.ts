/**
 * Measured points for a line-probe chart, read from a small CSV: per row a position (in the chart's x
 * measure), a value and optionally its uncertainty (± half-width, same unit). Separators: comma, semicolon,
 * tab or spaces; `#` lines are comments; a first row that is not numbers is the header (its names label the
 * points). Pure: no DOM.
 */

/** Rows read at most (a measured profile has tens to thousands of points). */
export const MAX_MEASURED_ROWS = 100_000;

export interface MeasuredPoints {
  /** File name, for the legend and messages. */
  name: string;
  /** Column names from the header, or `x`, `value`, `uncertainty`. */
  columns: string[];
  x: Float64Array;
  y: Float64Array;
  /** ± half-widths, or null when the file has no third column. */
  uncertainty: Float64Array | null;
}

/** Cells of a row: by comma, semicolon or tab when the row has one, else by spaces. */
const split = (line: string): string[] => (/[,;\t]/.test(line) ? line.split(/[,;\t]/).map((c) => c.trim()) : line.trim().split(/\s+/));

/** Parses the text; throws a one-line error naming the file, the line and what was expected. */
export function parseMeasuredCsv(text: string, name: string): MeasuredPoints {
  const rows: number[][] = [];
  let columns: string[] | undefined, width = 0;
  const lines = text.split(/\r?\n/);
  for (let i = 0; i < lines.length; i++) {
    const line = lines[i]!.trim();
    if (line === '' || line.startsWith('#')) continue;
    const cells = split(line);
    const nums = cells.map((c) => (c === '' ? NaN : Number(c)));
    if (rows.length === 0 && columns === undefined && nums.some((v) => Number.isNaN(v))) {
      if (cells.length < 2 || cells.length > 3) throw new Error(`${name}: line ${i + 1}: expected a header of 2 or 3 names (position, value[, uncertainty]), got ${cells.length}`);
      columns = cells;
      continue;
    }
    if (nums.length < 2 || nums.length > 3) throw new Error(`${name}: line ${i + 1}: expected 2 or 3 numbers (position, value[, uncertainty]), got ${nums.length} ("${line.slice(0, 60)}")`);
    const bad = nums.findIndex((v) => !Number.isFinite(v));
    if (bad >= 0) throw new Error(`${name}: line ${i + 1}: column ${bad + 1} is not a finite number ("${cells[bad]}")`);
    if (width === 0) width = nums.length;
    else if (nums.length !== width) throw new Error(`${name}: line ${i + 1}: expected ${width} numbers like the rows above, got ${nums.length}`);
    if (width === 3 && nums[2]! < 0) throw new Error(`${name}: line ${i + 1}: the uncertainty ${nums[2]} is negative (expected a ± half-width ≥ 0)`);
    rows.push(nums);
    if (rows.length > MAX_MEASURED_ROWS) throw new Error(`${name}: more than ${MAX_MEASURED_ROWS} rows (expected a measured profile)`);
  }
  if (rows.length === 0) throw new Error(`${name}: no rows of numbers (expected position, value[, uncertainty] per line)`);
  if (columns && columns.length !== width) throw new Error(`${name}: the header names ${columns.length} columns, the rows hold ${width}`);
  const col = (k: number) => Float64Array.from(rows, (r) => r[k]!);
  return {
    name, columns: columns ?? ['x', 'value', 'uncertainty'].slice(0, width),
    x: col(0), y: col(1), uncertainty: width === 3 ? col(2) : null,
  };
}
