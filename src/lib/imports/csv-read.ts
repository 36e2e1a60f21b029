/**
 * Spreadsheet CSV reading for imports (CONTRACT.md "Imports"): UTF-8 with or without BOM, LF or CRLF,
 * comma or semicolon delimiter (detected from the header row), RFC 4180 quoting via papaparse, blank lines
 * ignored, headers case-insensitive with surrounding spaces trimmed, data rows numbered from 1 (CONTRACT.md). Each
 * record also knows its line in the spreadsheet the file came from (the header's row is usually line 1; blank
 * rows count, as a spreadsheet shows them), so that a problem can be found in the sheet.
 */
import Papa from 'papaparse';

export type CsvTable = {
  /** Normalised header names (lower case, trimmed, inner spaces as `_`). */
  headers: string[];
  /** Data records; `row` is 1 for the first data row. Cells are trimmed strings ('' = no value). */
  records: Array<{ row: number; line: number; cells: Record<string, string> }>;
  /** Spreadsheet line of the header row. */
  headerLine: number;
  delimiter: ',' | ';';
};

/** A file that cannot be read as a table at all (no header, unbalanced quotes …). */
export class CsvFormatError extends Error {
  constructor(
    message: string,
    readonly row?: number,
  ) {
    super(message);
    this.name = 'CsvFormatError';
  }
}

/** Lower-case, trim and snake-case a header cell. */
export function normaliseHeader(h: string): string {
  return h
    .replace(/^\uFEFF/, '')
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_');
}

/** Choose ',' or ';' by counting each outside quotes in the first line. */
export function detectDelimiter(text: string): ',' | ';' {
  let commas = 0;
  let semis = 0;
  let inQuotes = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === '"') inQuotes = !inQuotes;
    else if (!inQuotes && (c === '\n' || c === '\r')) break;
    else if (!inQuotes && c === ',') commas++;
    else if (!inQuotes && c === ';') semis++;
  }
  return semis > commas ? ';' : ',';
}

/** Parse CSV text into a header list and trimmed records. */
export function readCsv(input: string): CsvTable {
  const text = input.replace(/^\uFEFF/, '');
  if (text.trim() === '') throw new CsvFormatError('The file is empty: expected a header row and data rows.');
  // Detect from the first line that holds anything (blank lines above the header are allowed).
  const delimiter = detectDelimiter(text.replace(/^(?:[ \t]*\r?\n)+/, ''));
  const parsed = Papa.parse<string[]>(text, { delimiter, skipEmptyLines: false, header: false });
  const quoteError = parsed.errors.find((e) => e.type === 'Quotes');
  const rows = parsed.data;
  // Drop blank lines (including trailing ones) but keep record numbering by data records; remember each record's
  // spreadsheet line (its index among all records, blank ones included, from 1; a quoted line break stays in its row).
  const nonBlank = rows
    .map((r, i) => ({ r, line: i + 1 }))
    .filter(({ r }) => !(r.length === 1 && (r[0] ?? '').trim() === '') && r.some((c) => c.trim() !== ''));
  const headerRow = nonBlank[0]?.r;
  if (!headerRow) throw new CsvFormatError('The file has no header row.');
  if (quoteError) {
    throw new CsvFormatError(
      `A quoted field is not closed (near data row ${Math.max(1, (quoteError.row ?? 1) as number)}): check the quotes.`,
      quoteError.row,
    );
  }
  const headers = headerRow.map(normaliseHeader);
  const records = nonBlank.slice(1).map(({ r, line }, i) => {
    const cells: Record<string, string> = {};
    headers.forEach((h, j) => {
      if (h !== '' && !(h in cells)) cells[h] = unguardFormula((r[j] ?? '').trim());
    });
    return { row: i + 1, line, cells };
  });
  return { headers, records, delimiter, headerLine: nonBlank[0]!.line };
}

/**
 * Undo the guard our exports (and careful spreadsheet users) put before a cell that a spreadsheet would run as a
 * formula: a leading apostrophe before =, +, -, @ is dropped, so an exported file re-imports unchanged.
 */
export function unguardFormula(cell: string): string {
  return /^'[=+\-@]/.test(cell) ? cell.slice(1) : cell;
}
