// 10^0 … 10^22: every one exactly representable in binary64.
export const POW10 = Float64Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));

/**
 * The value of text[start, end) when it is a plain decimal — [+-]digits[.digits][(e|E)[+-]digits],
 * at least one mantissa digit, nothing else (no spaces) — and finite; NaN otherwise, for the
 * caller to take the general path. Equal to Number() of the same text, bit for bit: with at most
 * 15 digits the mantissa M is an exact integer below 2^53 and 10^|e| ≤ 10^22 is exact, so
 * M·10^e or M/10^−e is one correctly rounded operation (W. D. Clinger, "How to read floating
 * point numbers accurately", PLDI 1990, the fast path); other plain decimals go to Number().
 */
export function plainDecimal(text: string, start: number, end: number): number {
  return scanDecimal(text, start, end, -1);
}

/**
 * Where the last successful scanDecimal stopped (the separator's position, or end), and the value
 * scanDecimalBytesTo read. A double field is written in place: returned from a call the engine
 * does not inline, a fractional number is boxed on the heap (one object per field of a trace row).
 */
export const scanned = { end: 0, value: NaN };

/**
 * plainDecimal of the field that starts at `start` and runs to the first `sep` (a char code) or
 * to end, read in the same pass that finds its end (left in scanned.end); NaN when the field is
 * not a plain decimal.
 */
export function scanDecimal(text: string, start: number, end: number, sep: number): number {
  let i = start;
  let c = i < end ? text.charCodeAt(i) : 0;
  const negative = c === 45; // '-'
  if (negative || c === 43) c = ++i < end ? text.charCodeAt(i) : 0; // '+'
  let mantissa = 0, digits = 0, fraction = 0;
  while (c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    c = ++i < end ? text.charCodeAt(i) : 0;
  }
  if (c === 46) { // '.'
    c = ++i < end ? text.charCodeAt(i) : 0;
    while (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      fraction++;
      c = ++i < end ? text.charCodeAt(i) : 0;
    }
  }
  if (digits === 0) return NaN;
  let exponent = 0;
  if (c === 101 || c === 69) { // 'e', 'E'
    c = ++i < end ? text.charCodeAt(i) : 0;
    const minus = c === 45;
    if (minus || c === 43) c = ++i < end ? text.charCodeAt(i) : 0;
    let expDigits = 0;
    while (c >= 48 && c <= 57) {
      if (exponent < 100_000) exponent = exponent * 10 + (c - 48);
      expDigits++;
      c = ++i < end ? text.charCodeAt(i) : 0;
    }
    if (expDigits === 0) return NaN;
    if (minus) exponent = -exponent;
  }
  if (i !== end && c !== sep) return NaN;
  scanned.end = i;
  const e = exponent - fraction;
  if (digits <= 15 && e >= -22 && e <= 22) {
    const v = e < 0 ? mantissa / POW10[-e] : mantissa * POW10[e];
    return negative ? -v : v;
  }
  // the sign is part of the text here
  const v = Number(text.substring(start, i));
  return Number.isFinite(v) ? v : NaN;
}

const asciiDecoder = new TextDecoder();

/**
 * scanDecimal on bytes: the field of bytes[start, end) up to the first `sep`, the same value bit
 * for bit (a plain decimal is ASCII, so its bytes are its characters); the end in scanned.end.
 */
export function scanDecimalBytes(bytes: Uint8Array, start: number, end: number, sep: number): number {
  scanDecimalBytesTo(bytes, start, end, sep);
  return scanned.value;
}

/** scanDecimalBytes with its value left in scanned.value (NaN when the field is not a plain decimal), nothing returned. */
export function scanDecimalBytesTo(bytes: Uint8Array, start: number, end: number, sep: number): void {
  let i = start;
  let c = i < end ? bytes[i] : 0;
  const negative = c === 45; // '-'
  if (negative || c === 43) c = ++i < end ? bytes[i] : 0; // '+'
  let mantissa = 0, digits = 0, fraction = 0;
  while (c >= 48 && c <= 57) {
    mantissa = mantissa * 10 + (c - 48);
    digits++;
    c = ++i < end ? bytes[i] : 0;
  }
  if (c === 46) { // '.'
    c = ++i < end ? bytes[i] : 0;
    while (c >= 48 && c <= 57) {
      mantissa = mantissa * 10 + (c - 48);
      digits++;
      fraction++;
      c = ++i < end ? bytes[i] : 0;
    }
  }
  if (digits === 0) {
    scanned.value = NaN;
    return;
  }
  let exponent = 0;
  if (c === 101 || c === 69) { // 'e', 'E'
    c = ++i < end ? bytes[i] : 0;
    const minus = c === 45;
    if (minus || c === 43) c = ++i < end ? bytes[i] : 0;
    let expDigits = 0;
    while (c >= 48 && c <= 57) {
      if (exponent < 100_000) exponent = exponent * 10 + (c - 48);
      expDigits++;
      c = ++i < end ? bytes[i] : 0;
    }
    if (expDigits === 0) {
      scanned.value = NaN;
      return;
    }
    if (minus) exponent = -exponent;
  }
  if (i !== end && c !== sep) {
    scanned.value = NaN;
    return;
  }
  scanned.end = i;
  const e = exponent - fraction;
  if (digits <= 15 && e >= -22 && e <= 22) {
    const v = e < 0 ? mantissa / POW10[-e] : mantissa * POW10[e];
    scanned.value = negative ? -v : v;
    return;
  }
  const v = Number(asciiDecoder.decode(bytes.subarray(start, i)));
  scanned.value = Number.isFinite(v) ? v : NaN;
}
