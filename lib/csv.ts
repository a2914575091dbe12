// What every CSV Cloche writes has in common.

/**
 * Text a person typed (a name, a reason) made safe for a spreadsheet: a cell that
 * starts with = + - @ or a control character would be run as a formula (OWASP, "CSV
 * Injection"), so it gets a leading apostrophe.
 */
export function csvText(value: string | null | undefined): string {
  if (value === null || value === undefined) return "";
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
}

/** A number with a fixed count of decimals, or empty. */
export function csvNumber(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? "" : value.toFixed(decimals);
}

const NEEDS_QUOTES = /[",\r\n]/;

/** One CSV field: quoted (quotes doubled) only when it holds a quote, comma, CR or LF, as csv-stringify writes it. */
export function csvCell(value: string): string {
  return NEEDS_QUOTES.test(value) ? `"${value.replaceAll('"', '""')}"` : value;
}

/** One CSV record and its line end. */
export function csvLine(fields: readonly string[]): string {
  return fields.map(csvCell).join(",") + "\n";
}
