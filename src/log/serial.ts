/** Longest serial accepted; board file names stay well inside every file system's limit. */
export const maxSerialLength = 64;

// Names Windows reserves for devices: a board file called `CON.json` cannot be
// created there, and a log folder is often copied to such a machine.
const reservedNames = /^(con|prn|aux|nul|com[1-9]|lpt[1-9])$/i;

/** What every rule below allows: 1–64 of A-Z a-z 0-9 . _ -, not starting with . or -, not ending with ., no "..". */
const plainSerial = /^(?![.-])(?!.*\.\.)[A-Za-z0-9._-]{1,64}(?<!\.)$/;

/**
 * Check a board serial before it becomes a file name (`boards/<serial>.json`).
 * Returns null when it is fine, else one line saying what is wrong and what is
 * allowed. ASCII letters, digits, `-`, `_` and `.` only: no path separators, no
 * `..`, no control characters, no leading dot or dash, no trailing dot, at most 64 characters.
 */
export function validateSerial(text: string): string | null {
  // The usual serial passes one pattern test (the index checks every board file's name on each read).
  if (plainSerial.test(text) && !reservedNames.test(text.split('.')[0] ?? '')) return null;
  const allowed = 'a serial may use letters A-Z a-z, digits, "-", "_" and "." (e.g. "EXB-0042")';
  if (text === '') return `the serial is empty; ${allowed}`;
  if (text.length > maxSerialLength)
    return `serial ${JSON.stringify(text.slice(0, 20))}… is ${text.length} characters long; at most ${maxSerialLength} are allowed`;
  for (const ch of text) {
    const code = ch.codePointAt(0) ?? 0;
    if (code < 0x20 || code === 0x7f || (code >= 0x80 && code < 0xa0)) {
      return `serial ${JSON.stringify(text)} contains a control character (U+${code.toString(16).toUpperCase().padStart(4, '0')}); ${allowed}`;
    }
    if (ch === '/' || ch === '\\') return `serial ${JSON.stringify(text)} contains a path separator "${ch}"; ${allowed}`;
  }
  if (text.includes('..')) return `serial ${JSON.stringify(text)} contains ".."; ${allowed}`;
  if (text.startsWith('.')) return `serial ${JSON.stringify(text)} starts with "."; ${allowed}`;
  if (text.startsWith('-')) return `serial ${JSON.stringify(text)} starts with "-" (it would read as an option); ${allowed}`;
  if (text.endsWith('.')) return `serial ${JSON.stringify(text)} ends with "."; ${allowed}`;
  const bad = /[^A-Za-z0-9._-]/.exec(text);
  if (bad) return `serial ${JSON.stringify(text)} contains ${JSON.stringify(bad[0])}; ${allowed}`;
  if (reservedNames.test(text.split('.')[0] ?? ''))
    return `serial ${JSON.stringify(text)} is a reserved device name on Windows; add a prefix, e.g. "SN-${text}"`;
  return null;
}
