// Score text: a double's shortest round-trip decimal, spelled as JavaScript's Number::toString spells it, written as
// ASCII into this module's own memory; and whole CSV rows "id,score,rank\n" for integer ids. The digits come from the
// Grisu3 algorithm (Loitsch, "Printing floating-point numbers quickly and accurately", PLDI 2010): exact whenever it
// answers, and it declines (about 0.5% of doubles) when 64-bit arithmetic cannot decide; the caller then asks
// JavaScript. So every text equals String(value).

// 10^k for k = -348, -340, ..., 340: significand rounded to nearest (2^63 ≤ f < 2^64) and binary exponent, so that
// 10^k ≈ f · 2^e. Generated with exact integer arithmetic; tests compare every text against String().
const POW_F: StaticArray<u64> = [
  0xfa8fd5a0081c0288, 0xbaaee17fa23ebf76, 0x8b16fb203055ac76, 0xcf42894a5dce35ea,
  0x9a6bb0aa55653b2d, 0xe61acf033d1a45df, 0xab70fe17c79ac6ca, 0xff77b1fcbebcdc4f,
  0xbe5691ef416bd60c, 0x8dd01fad907ffc3c, 0xd3515c2831559a83, 0x9d71ac8fada6c9b5,
  0xea9c227723ee8bcb, 0xaecc49914078536d, 0x823c12795db6ce57, 0xc21094364dfb5637,
  0x9096ea6f3848984f, 0xd77485cb25823ac7, 0xa086cfcd97bf97f4, 0xef340a98172aace5,
  0xb23867fb2a35b28e, 0x84c8d4dfd2c63f3b, 0xc5dd44271ad3cdba, 0x936b9fcebb25c996,
  0xdbac6c247d62a584, 0xa3ab66580d5fdaf6, 0xf3e2f893dec3f126, 0xb5b5ada8aaff80b8,
  0x87625f056c7c4a8b, 0xc9bcff6034c13053, 0x964e858c91ba2655, 0xdff9772470297ebd,
  0xa6dfbd9fb8e5b88f, 0xf8a95fcf88747d94, 0xb94470938fa89bcf, 0x8a08f0f8bf0f156b,
  0xcdb02555653131b6, 0x993fe2c6d07b7fac, 0xe45c10c42a2b3b06, 0xaa242499697392d3,
  0xfd87b5f28300ca0e, 0xbce5086492111aeb, 0x8cbccc096f5088cc, 0xd1b71758e219652c,
  0x9c40000000000000, 0xe8d4a51000000000, 0xad78ebc5ac620000, 0x813f3978f8940984,
  0xc097ce7bc90715b3, 0x8f7e32ce7bea5c70, 0xd5d238a4abe98068, 0x9f4f2726179a2245,
  0xed63a231d4c4fb27, 0xb0de65388cc8ada8, 0x83c7088e1aab65db, 0xc45d1df942711d9a,
  0x924d692ca61be758, 0xda01ee641a708dea, 0xa26da3999aef774a, 0xf209787bb47d6b85,
  0xb454e4a179dd1877, 0x865b86925b9bc5c2, 0xc83553c5c8965d3d, 0x952ab45cfa97a0b3,
  0xde469fbd99a05fe3, 0xa59bc234db398c25, 0xf6c69a72a3989f5c, 0xb7dcbf5354e9bece,
  0x88fcf317f22241e2, 0xcc20ce9bd35c78a5, 0x98165af37b2153df, 0xe2a0b5dc971f303a,
  0xa8d9d1535ce3b396, 0xfb9b7cd9a4a7443c, 0xbb764c4ca7a44410, 0x8bab8eefb6409c1a,
  0xd01fef10a657842c, 0x9b10a4e5e9913129, 0xe7109bfba19c0c9d, 0xac2820d9623bf429,
  0x80444b5e7aa7cf85, 0xbf21e44003acdd2d, 0x8e679c2f5e44ff8f, 0xd433179d9c8cb841,
  0x9e19db92b4e31ba9, 0xeb96bf6ebadf77d9, 0xaf87023b9bf0ee6b,
];
const POW_E: StaticArray<i16> = [
  -1220, -1193, -1166, -1140, -1113, -1087, -1060, -1034, -1007, -980, -954, -927,
  -901, -874, -847, -821, -794, -768, -741, -715, -688, -661, -635, -608,
  -582, -555, -529, -502, -475, -449, -422, -396, -369, -343, -316, -289,
  -263, -236, -210, -183, -157, -130, -103, -77, -50, -24, 3, 30,
  56, 83, 109, 136, 162, 189, 216, 242, 269, 295, 322, 348,
  375, 402, 428, 455, 481, 508, 534, 561, 588, 614, 641, 667,
  694, 720, 747, 774, 800, 827, 853, 880, 907, 933, 960, 986,
  1013, 1039, 1066,
];
const FIRST_POWER = -348;
const POWER_STEP = 8;
/** Scaled values land in [2^ALPHA, 2^GAMMA) · 2^64 (Grisu's target window). */
const ALPHA = -60;

/** Decimal exponent of the last digits(): value = digits · 10^decimalExponent. */
let decimalExponent: i32 = 0;

/** Upper 64 bits of the 128-bit product, rounded (one unit of error at most). */
// @ts-ignore: decorator
@inline
function mulHigh(a: u64, b: u64): u64 {
  const a1 = a >> 32;
  const a0 = a & 0xffffffff;
  const b1 = b >> 32;
  const b0 = b & 0xffffffff;
  const hh = a1 * b1;
  const lh = a0 * b1;
  const hl = a1 * b0;
  const ll = a0 * b0;
  let mid = (ll >> 32) + (hl & 0xffffffff) + (lh & 0xffffffff);
  mid += 1 << 31;
  return hh + (hl >> 32) + (lh >> 32) + (mid >> 32);
}

/**
 * Moves the last digit down while that brings the digits closer to the value, then says whether the result is
 * certainly the closest shortest one (false: 64 bits cannot tell).
 */
function roundWeed(buf: usize, len: i32, distanceTooHighW: u64, unsafeInterval: u64, rest: u64, tenKappa: u64, unit: u64): bool {
  const small = distanceTooHighW - unit;
  const big = distanceTooHighW + unit;
  const last = buf + <usize>len - 1;
  while (
    rest < small &&
    unsafeInterval - rest >= tenKappa &&
    (rest + tenKappa < small || small - rest >= rest + tenKappa - small)
  ) {
    store<u8>(last, load<u8>(last) - 1);
    rest += tenKappa;
  }
  if (rest < big && unsafeInterval - rest >= tenKappa && (rest + tenKappa < big || big - rest > rest + tenKappa - big)) {
    return false;
  }
  return 2 * unit <= rest && rest <= unsafeInterval - 4 * unit;
}

/**
 * The shortest digits of a positive finite double as ASCII at buf; returns their count and sets decimalExponent,
 * or returns -1 when Grisu3 declines.
 */
function digits(value: f64, buf: usize): i32 {
  const bits = reinterpret<u64>(value);
  const biased = <i32>((bits >> 52) & 0x7ff);
  const fraction = bits & 0xfffffffffffff;
  let f: u64;
  let e: i32;
  if (biased == 0) {
    f = fraction;
    e = -1074;
  } else {
    f = fraction | (<u64>1 << 52);
    e = biased - 1075;
  }
  // Boundaries m−, m+ halfway to the neighbouring doubles, on m+'s (normalised) exponent; w normalised lands there too.
  let plus = (f << 1) + 1;
  const plusShift = <i32>clz(plus);
  plus <<= <u64>plusShift;
  const we = e - 1 - plusShift;
  let minus: u64;
  if (fraction == 0 && biased > 1) minus = ((f << 2) - 1) << <u64>(plusShift - 1);
  else minus = ((f << 1) - 1) << <u64>plusShift;
  const w = f << <u64>(plusShift + 1);

  // The cached power c = 10^mk that brings w's exponent into the target window.
  const k = <i32>Math.ceil(<f64>(ALPHA - (we + 64) + 63) * 0.30102999566398114);
  const index = (-FIRST_POWER + k - 1) / POWER_STEP + 1;
  const cf = unchecked(POW_F[index]);
  const mk = FIRST_POWER + POWER_STEP * index;
  const e2 = we + <i32>unchecked(POW_E[index]) + 64;

  const scaledW = mulHigh(w, cf);
  const scaledMinus = mulHigh(minus, cf);
  const scaledPlus = mulHigh(plus, cf);

  // Digit generation over the unsafe interval (too low, too high): one unit of error each side.
  let unit: u64 = 1;
  const tooLow = scaledMinus - unit;
  const tooHigh = scaledPlus + unit;
  let unsafeInterval = tooHigh - tooLow;
  const shift = <u64>(-e2);
  const one: u64 = <u64>1 << shift;
  const mask = one - 1;
  let integrals = <u32>(tooHigh >> shift);
  let fractionals = tooHigh & mask;
  let divisor: u32 = 1;
  let kappa: i32 = 1;
  while (divisor <= 429496729 && divisor * 10 <= integrals) {
    divisor *= 10;
    kappa++;
  }
  let len: i32 = 0;
  while (kappa > 0) {
    const digit = integrals / divisor;
    store<u8>(buf + <usize>len, <u8>(48 + digit));
    len++;
    integrals %= divisor;
    kappa--;
    const rest = (<u64>integrals << shift) + fractionals;
    if (rest < unsafeInterval) {
      decimalExponent = kappa - mk;
      return roundWeed(buf, len, tooHigh - scaledW, unsafeInterval, rest, <u64>divisor << shift, unit) ? len : -1;
    }
    divisor /= 10;
  }
  for (;;) {
    fractionals *= 10;
    unit *= 10;
    unsafeInterval *= 10;
    store<u8>(buf + <usize>len, <u8>(48 + (fractionals >> shift)));
    len++;
    fractionals &= mask;
    kappa--;
    if (fractionals < unsafeInterval) {
      decimalExponent = kappa - mk;
      return roundWeed(buf, len, (tooHigh - scaledW) * unit, unsafeInterval, fractionals, one, unit) ? len : -1;
    }
  }
  return -1; // not reached: the loop ends once fractionals fall below the (growing) unsafe interval
}

/** Scratch for one number's digits. */
const DIGITS = memory.data(32);

/** Copies n bytes; for the handful of bytes of a number. */
// @ts-ignore: decorator
@inline
function copyBytes(to: usize, from: usize, n: usize): void {
  for (let i: usize = 0; i < n; i++) store<u8>(to + i, load<u8>(from + i));
}

/**
 * String(value) as ASCII at `at`; returns the byte count, or -1 (NaN, ±Infinity, or Grisu3 declined: ask JavaScript).
 */
export function text(value: f64, at: usize): i32 {
  if (value == 0) {
    store<u8>(at, 48);
    return 1;
  }
  if (!isFinite(value)) return -1;
  let p = at;
  if (value < 0) {
    store<u8>(p++, 45);
    value = -value;
  }
  const k = digits(value, DIGITS);
  if (k < 0) return -1;
  const n = k + decimalExponent; // the decimal point sits after n digits
  if (k <= n && n <= 21) {
    copyBytes(p, DIGITS, k);
    p += k;
    for (let i = k; i < n; i++) store<u8>(p++, 48);
  } else if (0 < n && n <= 21) {
    copyBytes(p, DIGITS, n);
    p += n;
    store<u8>(p++, 46);
    copyBytes(p, DIGITS + n, k - n);
    p += k - n;
  } else if (-6 < n && n <= 0) {
    store<u8>(p++, 48);
    store<u8>(p++, 46);
    for (let i = n; i < 0; i++) store<u8>(p++, 48);
    copyBytes(p, DIGITS, k);
    p += k;
  } else {
    store<u8>(p++, load<u8>(DIGITS));
    if (k > 1) {
      store<u8>(p++, 46);
      copyBytes(p, DIGITS + 1, k - 1);
      p += k - 1;
    }
    store<u8>(p++, 101);
    let x = n - 1;
    if (x < 0) {
      store<u8>(p++, 45);
      x = -x;
    } else store<u8>(p++, 43);
    p = putU64(p, <u64>x);
  }
  return <i32>(p - at);
}

/** Decimal digits of v at p; returns the end. */
function putU64(p: usize, v: u64): usize {
  let len: usize = 1;
  for (let t = v; t >= 10; t /= 10) len++;
  let q = p + len;
  while (v >= 10) {
    const r = v / 10;
    store<u8>(--q, <u8>(48 + (v - r * 10)));
    v = r;
  }
  store<u8>(--q, <u8>(48 + v));
  return p + len;
}

/** Rows written by the last rows() call. */
let rowsDone: u32 = 0;

export function done(): u32 {
  return rowsDone;
}

/**
 * CSV rows "id,score,rank\n" for `count` nodes: ids (u64) and scores (f64) at `ids`/`scores`, ranks from
 * `firstRank`; text to `out`. Returns the bytes written. Stops before a row whose score text Grisu3 declines:
 * done() then says how many rows were written, and the caller writes that row itself.
 */
export function rows(ids: usize, scores: usize, count: u32, firstRank: u32, out: usize): usize {
  let p = out;
  // Rows in rank order repeat scores often: the previous score's text is copied.
  let prev: u64 = 0xffffffffffffffff;
  let prevAt: usize = 0;
  let prevLen: usize = 0;
  for (let i: u32 = 0; i < count; i++) {
    const rowStart = p;
    p = putU64(p, load<u64>(ids + (<usize>i << 3)));
    store<u8>(p++, 44);
    const bits = load<u64>(scores + (<usize>i << 3));
    if (bits == prev) {
      copyBytes(p, prevAt, prevLen);
      p += prevLen;
    } else {
      const len = text(reinterpret<f64>(bits), p);
      if (len < 0) {
        rowsDone = i;
        return rowStart - out;
      }
      prev = bits;
      prevAt = p;
      prevLen = <usize>len;
      p += <usize>len;
    }
    store<u8>(p++, 44);
    p = putU64(p, <u64>(firstRank + i));
    store<u8>(p++, 10);
  }
  rowsDone = count;
  return p - out;
}

/** First byte after the module's static data: callers place their buffers from here on. */
export function dataEnd(): usize {
  return __heap_base;
}
