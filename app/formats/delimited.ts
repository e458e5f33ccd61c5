// Delimited text (CSV, semicolon, tab) read row by row by papaparse, each row with the 1-based line
// it starts on, for the site and sounding readers.
import Papa from 'papaparse';

/** One row as papaparse read it: its cells, the line it starts on, and papaparse's errors. */
export interface DelimitedRow {
  cells: string[];
  line: number;
  errors: { message: string }[];
}

/**
 * Streams `text` (lines ended by '\n') to `onRow` row by row until it returns false (papaparse
 * abort); `firstLine` is the line number of the text's first line. Blank lines are passed on.
 */
export function delimitedRows(
  text: string,
  delimiter: string,
  firstLine: number,
  onRow: (row: DelimitedRow) => boolean,
): void {
  let cursor = 0;
  let line = firstLine;
  Papa.parse<string[]>(text, {
    delimiter,
    newline: '\n',
    skipEmptyLines: false,
    step: (res, parser) => {
      const start = line;
      const end = res.meta.cursor;
      for (let i = cursor; i < end && i < text.length; i++) if (text.charCodeAt(i) === 10) line++;
      cursor = end;
      const cells = res.data.map((c) => String(c ?? ''));
      if (!onRow({ cells, line: start, errors: res.errors })) parser.abort();
    },
  });
}
