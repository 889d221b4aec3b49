/**
 * A strict RFC 4180 reader for the tests: CRLF record ends, fields optionally quoted with doubled
 * quotes inside. Throws on a bare quote in an unquoted field or an unterminated quoted field.
 */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let i = 0;
  while (i < text.length) {
    let field = '';
    if (text[i] === '"') {
      i++;
      for (;;) {
        if (i >= text.length) throw new Error('unterminated quoted field');
        if (text[i] === '"') {
          if (text[i + 1] === '"') {
            field += '"';
            i += 2;
          } else {
            i++;
            break;
          }
        } else field += text[i++];
      }
    } else {
      while (i < text.length && text[i] !== ',' && text[i] !== '\r') {
        if (text[i] === '"' || text[i] === '\n') throw new Error(`bare ${JSON.stringify(text[i])} at ${i}`);
        field += text[i++];
      }
    }
    row.push(field);
    if (text[i] === ',') i++;
    else if (text.startsWith('\r\n', i)) {
      rows.push(row);
      row = [];
      i += 2;
    } else if (i < text.length) throw new Error(`unexpected ${JSON.stringify(text[i])} at ${i}`);
  }
  if (row.length > 0) throw new Error('last record lacks CRLF');
  return rows;
}
