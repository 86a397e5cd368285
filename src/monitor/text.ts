// Reading an uploaded file as text: refuse what is not a text CSV (a workbook, an image, a
// zip), then decode UTF-8 — or UTF-16 with its byte-order mark, or else Windows-1252, which is
// what many spreadsheet and monitor exports on Windows write.

export type Decoded = { ok: true; text: string } | { ok: false; message: string };

const startsWith = (b: Uint8Array, sig: number[]) => sig.every((x, i) => b[i] === x);

/** The file as text, or why it is not a text CSV. */
export function decodeCsvBytes(bytes: Uint8Array): Decoded {
  if (bytes.byteLength === 0) return { ok: false, message: 'The file is empty.' };
  if (startsWith(bytes, [0x50, 0x4b, 0x03, 0x04])) {
    return { ok: false, message: 'This is a spreadsheet workbook or a zip archive, not a CSV. Export the log as CSV (comma- or semicolon-separated text) and upload that.' };
  }
  if (startsWith(bytes, [0xd0, 0xcf, 0x11, 0xe0])) {
    return { ok: false, message: 'This is an older spreadsheet workbook (.xls), not a CSV. Save it as CSV text and upload that.' };
  }
  if (startsWith(bytes, [0x25, 0x50, 0x44, 0x46])) return { ok: false, message: 'This is a PDF, not a CSV. Upload the monitor’s CSV export.' };
  if (startsWith(bytes, [0x89, 0x50, 0x4e, 0x47]) || startsWith(bytes, [0xff, 0xd8, 0xff])) {
    return { ok: false, message: 'This is an image, not a CSV. Upload the monitor’s CSV export.' };
  }
  let text: string;
  if (startsWith(bytes, [0xff, 0xfe])) text = new TextDecoder('utf-16le').decode(bytes.subarray(2));
  else if (startsWith(bytes, [0xfe, 0xff])) text = new TextDecoder('utf-16be').decode(bytes.subarray(2));
  else {
    // A NUL byte never appears in a text CSV in these encodings.
    const head = bytes.subarray(0, 64 * 1024);
    if (head.includes(0)) return { ok: false, message: 'This file is binary, not a text CSV. Upload the monitor’s CSV export.' };
    try {
      text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    } catch {
      text = new TextDecoder('windows-1252').decode(bytes);
    }
  }
  text = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
  if (text.trim() === '') return { ok: false, message: 'The file is empty: it has no lines with readings.' };
  return { ok: true, text };
}

/** Cells of one line split on `delimiter`, honouring double quotes (for detection only; parsing uses papaparse). */
export function splitLine(line: string, delimiter: string): string[] {
  const cells: string[] = [];
  let cur = '';
  let quoted = false;
  for (let i = 0; i < line.length; i++) {
    const ch = line[i];
    if (quoted) {
      if (ch === '"') {
        if (line[i + 1] === '"') {
          cur += '"';
          i++;
        } else quoted = false;
      } else cur += ch;
    } else if (ch === '"' && cur.trim() === '') {
      quoted = true;
      cur = '';
    } else if (ch === delimiter) {
      cells.push(cur);
      cur = '';
    } else cur += ch;
  }
  cells.push(cur);
  return cells;
}
