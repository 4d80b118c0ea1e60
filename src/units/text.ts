/**
 * Hygiene for the free text people type (operator names, plan titles, notes)
 * and for any text that reaches a terminal or a report. An escape sequence in
 * an operator name would colour or clear the screen, a newline would forge an
 * extra line in a history, HTML would pass into a Markdown report.
 */

/** Longest operator name kept. */
export const maxOperatorLength = 64;
/** Longest plan title kept. */
export const maxTitleLength = 200;

// C0 controls, DEL and C1 controls (ESC and CSI among them), and the Unicode
// bidirectional overrides and isolates that can reorder what a reader sees.
const controls = /[\u0000-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/g;
const lineBreaks = /[\t\n\v\f\r\u0085\u2028\u2029]+/g;

/** Whether the text holds any control character (line breaks and tabs included). */
export function hasControl(text: string): boolean {
  controls.lastIndex = 0;
  const found = controls.test(text);
  controls.lastIndex = 0;
  return found;
}

/**
 * Typed text made into one clean line: tabs and line breaks become a space,
 * other control characters go, outer spaces are trimmed.
 */
export function oneLine(text: string): string {
  return flatten(text).trim();
}

/** As `oneLine`, keeping outer spaces (for lines laid out with indents). */
export function flatten(text: string): string {
  return text.replace(lineBreaks, ' ').replace(controls, '');
}

/**
 * Output for a terminal: every control character except the line feed (and the
 * tab and carriage return that tables and CSV use) shown as a visible `\uXXXX`
 * escape, so nothing stored in a log can drive the terminal. Inside JSON
 * strings the same escape is exact (JSON.parse gives the character back).
 */
export function terminalSafe(text: string): string {
  return text.replace(
    /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f\u202a-\u202e\u2066-\u2069]/g,
    (c) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`,
  );
}

/**
 * Text safe inside a Markdown table cell or list item (CommonMark/GFM): one line,
 * no control characters, the table's `|`, emphasis and code marks escaped with a
 * backslash, and `<`, `>`, `&` written as entities so no HTML passes through.
 */
export function markdownText(text: string): string {
  return oneLine(text)
    .replace(/&/g, '&amp;')
    .replace(/</g, '&lt;')
    .replace(/>/g, '&gt;')
    .replace(/([\\|`*_[\]])/g, '\\$1');
}

/** Text safe inside a Markdown code span in a table: one line, `|` escaped (GFM), no backtick to end the span early. */
export function markdownCode(text: string): string {
  return oneLine(text).replace(/`/g, "'").replace(/\|/g, '\\|');
}
