// Byte-level helpers for the line parser: exact unsigned 64-bit decimals, weights, UTF-8 validation.

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22];

/**
 * Parse the all-digit field buf[s..e) as an unsigned 64-bit integer into out[0] (low 32 bits) and out[1] (high),
 * exactly: the low half accumulates lo·10 + d (below 2^36) and carries into hi·10. Returns false above 2^64 − 1.
 */
export function parseU64Digits(buf: Uint8Array, s: number, e: number, out: Uint32Array): boolean {
  let lo = 0;
  let hi = 0;
  for (let i = s; i < e; i++) {
    lo = lo * 10 + (buf[i] - 48);
    const carry = Math.floor(lo / 4294967296);
    lo -= carry * 4294967296;
    hi = hi * 10 + carry;
    if (hi >= 4294967296) return false;
  }
  out[0] = lo;
  out[1] = hi;
  return true;
}

export function isAllDigits(buf: Uint8Array, s: number, e: number): boolean {
  if (s >= e) return false;
  for (let i = s; i < e; i++) {
    const d = buf[i] - 48;
    if (d < 0 || d > 9) return false;
  }
  return true;
}

/**
 * Parse a decimal weight. Returns undefined for text that is not a number; NaN/±Infinity for nan/inf spellings
 * (the caller rejects them with their own reason). Short decimals take the exact fast path (integer mantissa below
 * 2^53 scaled by an exactly representable power of ten: one correctly rounded operation); the rest use Number().
 */
export function parseWeight(buf: Uint8Array, s: number, e: number): number | undefined {
  if (s >= e) return undefined;
  let i = s;
  let neg = false;
  if (buf[i] === 43 || buf[i] === 45) {
    neg = buf[i] === 45;
    i++;
  }
  const special = specialValue(buf, i, e);
  if (special !== undefined) return neg ? -special : special;
  let mant = 0;
  let digits = 0;
  let scale = 0;
  let sawDigit = false;
  while (i < e && buf[i] >= 48 && buf[i] <= 57) {
    if (digits > 0 || buf[i] !== 48) digits++;
    mant = mant * 10 + (buf[i] - 48);
    sawDigit = true;
    i++;
  }
  if (i < e && buf[i] === 46) {
    i++;
    while (i < e && buf[i] >= 48 && buf[i] <= 57) {
      if (digits > 0 || buf[i] !== 48) digits++;
      mant = mant * 10 + (buf[i] - 48);
      scale--;
      sawDigit = true;
      i++;
    }
  }
  if (!sawDigit) return undefined;
  let exp = 0;
  if (i < e && (buf[i] === 101 || buf[i] === 69)) {
    i++;
    let eneg = false;
    if (i < e && (buf[i] === 43 || buf[i] === 45)) {
      eneg = buf[i] === 45;
      i++;
    }
    if (i >= e) return undefined;
    let ed = 0;
    while (i < e && buf[i] >= 48 && buf[i] <= 57) {
      if (exp < 100000) exp = exp * 10 + (buf[i] - 48);
      ed++;
      i++;
    }
    if (ed === 0) return undefined;
    if (eneg) exp = -exp;
  }
  if (i !== e) return undefined;
  const p = scale + exp;
  let v: number;
  if (digits <= 15 && p >= -22 && p <= 22) v = p < 0 ? mant / POW10[-p] : mant * POW10[p];
  else v = Number(latin1(buf, s, e));
  return neg ? -v : v;
}

function specialValue(buf: Uint8Array, s: number, e: number): number | undefined {
  const len = e - s;
  if (len !== 3 && len !== 8) return undefined;
  const word = latin1(buf, s, e).toLowerCase();
  if (word === "nan") return NaN;
  if (word === "inf" || word === "infinity") return Infinity;
  return undefined;
}

export function latin1(buf: Uint8Array, s: number, e: number): string {
  let t = "";
  for (let i = s; i < e; i++) t += String.fromCharCode(buf[i]);
  return t;
}

/** True when buf[s..e) is well-formed UTF-8 (no overlongs, no surrogates, nothing above U+10FFFF). */
export function isValidUtf8(buf: Uint8Array, s: number, e: number): boolean {
  let i = s;
  while (i < e) {
    const b = buf[i];
    if (b < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let min: number;
    let cp: number;
    if (b >= 0xc2 && b <= 0xdf) {
      need = 1;
      min = 0x80;
      cp = b & 0x1f;
    } else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      min = 0x800;
      cp = b & 0x0f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      min = 0x10000;
      cp = b & 0x07;
    } else return false;
    if (i + need >= e) return false;
    for (let k = 1; k <= need; k++) {
      const c = buf[i + k];
      if ((c & 0xc0) !== 0x80) return false;
      cp = (cp << 6) | (c & 0x3f);
    }
    if (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff)) return false;
    i += need + 1;
  }
  return true;
}
