/**
 * Number parsing straight from bytes, so a 130 MB capture is never decoded to a
 * string. `scanNumber` returns the value (NaN when the bytes there are not a
 * number) and leaves the position after it in `scan.end`; a module-level cursor
 * rather than a returned object keeps the hot loop free of allocations.
 */
export const scan = { end: 0 };

const pow10 = new Float64Array(309);
pow10[0] = 1;
for (let i = 1; i < pow10.length; i++) pow10[i] = (pow10[i - 1] ?? 1) * 10;

const SPACE = 32;
const QUOTE = 34;
const PLUS = 43;
const MINUS = 45;
const ZERO = 48;
const NINE = 57;
const LOWER_E = 101;
const UPPER_E = 69;

/**
 * Read a decimal number at `pos` (spaces, not tabs, and a surrounding `"` allowed):
 * `-1.25e-3`, `+4`, `.5`, `3,3` when `decimal` is the comma's code. Digits past
 * the 17th only shift the exponent; the result is within a few units in the
 * last place of the correctly rounded value — far below any instrument's
 * resolution (common practice, no source).
 */
export function scanNumber(buf: Uint8Array, pos: number, end: number, decimal: number): number {
  let i = pos;
  let c = buf[i] ?? 0;
  while (i < end && c === SPACE) c = buf[++i] ?? 0;
  const quoted = c === QUOTE;
  if (quoted) c = buf[++i] ?? 0;
  let negative = false;
  if (c === MINUS || c === PLUS) {
    negative = c === MINUS;
    c = buf[++i] ?? 0;
  }
  let mantissa = 0;
  let digits = 0;
  let significant = 0;
  let exponent = 0;
  while (i < end && c >= ZERO && c <= NINE) {
    if (significant < 17) {
      mantissa = mantissa * 10 + (c - ZERO);
      if (mantissa > 0) significant++;
    } else exponent++;
    digits++;
    c = buf[++i] ?? 0;
  }
  if (i < end && c === decimal) {
    c = buf[++i] ?? 0;
    while (i < end && c >= ZERO && c <= NINE) {
      if (significant < 17) {
        mantissa = mantissa * 10 + (c - ZERO);
        if (mantissa > 0) significant++;
        exponent--;
      }
      digits++;
      c = buf[++i] ?? 0;
    }
  }
  if (digits === 0) {
    scan.end = i;
    return Number.NaN;
  }
  if (i < end && (c === LOWER_E || c === UPPER_E)) {
    const j = scanExponent(buf, i + 1, end);
    if (j >= 0) {
      exponent += exponentValue[0] as number;
      i = j;
      c = buf[i] ?? 0;
    }
  }
  if (quoted && c === QUOTE) c = buf[++i] ?? 0;
  while (i < end && c === SPACE) c = buf[++i] ?? 0;
  scan.end = i;
  let value: number;
  if (mantissa === 0) value = 0;
  else if (exponent >= 0) value = exponent > 308 ? Infinity : mantissa * (pow10[exponent] ?? Infinity);
  else if (exponent >= -308) value = mantissa / (pow10[-exponent] ?? Infinity);
  else value = mantissa / 1e308 / (pow10[-exponent - 308] ?? Infinity);
  return negative ? -value : value;
}

/**
 * The fast path of `scanNumber` for the common field: an optional sign,
 * digits, an optional decimal part and exponent, at most 15 digits, no spaces
 * or quotes. The caller guarantees a line feed before the end of `buf`, so no
 * read goes past it. Returns −1 for anything else (the caller then uses
 * `scanNumber`); otherwise the position after the number, with the very value
 * `scanNumber` gives in `plainValue[0]`: up to 15 digits make an integer below 2^53,
 * exact however it is summed, and the scaling is the same. The digits go into
 * two small integers (9 + 6 digits) rather than one double: a double's
 * multiply-add waits on the one before, an integer's is quicker (measured on
 * the bench captures: 0.83–0.87× the time of a double accumulator, and one
 * loop for both sides of the marker another 0.74–0.78×; the exponent in a
 * helper keeps this function under the inlining limit, another 0.84–0.88×,
 * seen with --trace-turbo-inlining). The value goes out
 * through a typed array and the position as a small integer, so no double is
 * boxed per field.
 */
export const plainValue = new Float64Array(1);

export function scanPlain(buf: Uint8Array, pos: number, decimal: number): number {
  let i = pos;
  let c = buf[i] as number;
  let negative = false;
  if (c === MINUS || c === PLUS) {
    negative = c === MINUS;
    c = buf[++i] as number;
  }
  let hi = 0;
  let lo = 0;
  let loDigits = 0;
  let digits = 0;
  let exponent = 0;
  // One loop for both sides of the decimal marker: small enough for the
  // compiler to inline into the row loop.
  let fraction = 0;
  for (;;) {
    const d = (c - ZERO) >>> 0;
    if (d < 10) {
      if (digits < 9) hi = hi * 10 + d;
      else {
        lo = lo * 10 + d;
        loDigits++;
      }
      digits++;
      exponent -= fraction;
    } else if (c === decimal && fraction === 0) fraction = 1;
    else break;
    c = buf[++i] as number;
  }
  // No digits, or more than 15: leave it to scanNumber.
  if (digits === 0 || digits > 15) return -1;
  if (c === LOWER_E || c === UPPER_E) {
    i = scanExponent(buf, i + 1, buf.length);
    if (i < 0) return -1;
    exponent += exponentValue[0] as number;
  }
  const mantissa = loDigits === 0 ? hi : hi * (pow10[loDigits] as number) + lo;
  // scanNumber's scaling: the same operations for every exponent in range.
  let value: number;
  if (exponent < -308 || exponent > 308) value = scaleFar(mantissa, exponent);
  else value = exponent < 0 ? mantissa / (pow10[-exponent] as number) : mantissa * (pow10[exponent] as number);
  plainValue[0] = negative ? -value : value;
  return i;
}

const exponentValue = new Int32Array(1);

/**
 * The exponent's sign and digits from `from` (after the `e`) up to `end`; its
 * end, or −1 without digits, the value in `exponentValue[0]` (capped, as any
 * exponent past 10^5 over- or underflows). Shared by both scanners; kept apart
 * so `scanPlain` stays small enough to inline.
 */
function scanExponent(buf: Uint8Array, from: number, end: number): number {
  let i = from;
  let c = buf[i] as number;
  let negative = false;
  if (c === MINUS || c === PLUS) {
    negative = c === MINUS;
    c = buf[++i] as number;
  }
  let e = 0;
  const start = i;
  for (let d = (c - ZERO) >>> 0; i < end && d < 10; d = (c - ZERO) >>> 0) {
    if (e < 100000) e = e * 10 + d;
    c = buf[++i] as number;
  }
  if (i === start) return -1;
  exponentValue[0] = negative ? -e : e;
  return i;
}

/** scanNumber's scaling beyond 10^±308. */
function scaleFar(mantissa: number, exponent: number): number {
  if (mantissa === 0) return 0;
  if (exponent > 308) return Infinity;
  return mantissa / 1e308 / (pow10[-exponent - 308] ?? Infinity);
}
