// Open-addressing map (linear probing) from unsigned 64-bit integer keys to dense ids 0..size-1 in insertion order.
// Keys are held as two 32-bit halves so that no key is ever rounded through a double.
// Slot layout: slots[2s] = key low half, slots[2s+1] = dense id + 1 (0 = empty); high halves live in keysHi[id] and
// are compared only once some key has a non-zero high half (the common all-32-bit case costs one cache line a probe).
// Halves travel as int32 (x | 0): a uint32 above 2^31 would be a boxed double in V8, allocating on every call.

const GOLDEN = 0x9e3779b1;
const MIX_HI = 0x85ebca6b;

export class U64Table {
  size = 0;
  /** True once any key ≥ 2^32 was inserted. */
  anyHi = false;
  keysLo: Uint32Array;
  keysHi: Uint32Array;
  private slots: Int32Array;
  private shift: number;
  private mask: number;

  constructor(expected = 1024) {
    let bits = 10;
    while (1 << bits < expected * 2 && bits < 30) bits++;
    this.slots = new Int32Array(2 << bits);
    this.mask = (1 << bits) - 1;
    this.shift = 32 - bits;
    this.keysLo = new Uint32Array(Math.max(16, expected));
    this.keysHi = new Uint32Array(Math.max(16, expected));
  }

  /** Dense id of (hi·2^32 + lo), inserting it when absent. Pass the halves as int32 (x | 0). */
  idOf(lo: number, hi: number): number {
    lo |= 0;
    hi |= 0;
    const slots = this.slots;
    let s = Math.imul(lo ^ Math.imul(hi, MIX_HI), GOLDEN) >>> this.shift;
    for (;;) {
      const tag = slots[2 * s + 1];
      if (tag === 0) return this.insertAt(s, lo, hi);
      if (slots[2 * s] === lo && (!this.anyHi || (this.keysHi[tag - 1] | 0) === hi)) return tag - 1;
      s = (s + 1) & this.mask;
    }
  }

  /** Dense id or -1. Pass the halves as int32 (x | 0). */
  find(lo: number, hi: number): number {
    lo |= 0;
    hi |= 0;
    const slots = this.slots;
    let s = Math.imul(lo ^ Math.imul(hi, MIX_HI), GOLDEN) >>> this.shift;
    for (;;) {
      const tag = slots[2 * s + 1];
      if (tag === 0) return -1;
      if (slots[2 * s] === lo && (this.keysHi[tag - 1] | 0) === hi) return tag - 1;
      s = (s + 1) & this.mask;
    }
  }

  /** Keys by dense id as BigInt values. */
  toBigIds(): BigUint64Array {
    const out = new BigUint64Array(this.size);
    for (let i = 0; i < this.size; i++) out[i] = (BigInt(this.keysHi[i]) << 32n) | BigInt(this.keysLo[i]);
    return out;
  }

  private insertAt(s: number, lo: number, hi: number): number {
    const id = this.size++;
    if (id === this.keysLo.length) {
      this.keysLo = growU32(this.keysLo);
      this.keysHi = growU32(this.keysHi);
    }
    this.keysLo[id] = lo;
    this.keysHi[id] = hi;
    if (hi !== 0) this.anyHi = true;
    this.slots[2 * s] = lo;
    this.slots[2 * s + 1] = id + 1;
    if (this.size * 2 > this.mask + 1) this.rehash();
    return id;
  }

  private rehash(): void {
    const bits = 32 - this.shift + 1;
    if (bits > 31) throw new RangeError("id table is full (over 2^30 distinct ids)");
    this.slots = new Int32Array(2 << bits);
    this.mask = (1 << bits) - 1;
    this.shift = 32 - bits;
    const slots = this.slots;
    for (let id = 0; id < this.size; id++) {
      const lo = this.keysLo[id] | 0;
      let s = Math.imul(lo ^ Math.imul(this.keysHi[id] | 0, MIX_HI), GOLDEN) >>> this.shift;
      while (slots[2 * s + 1] !== 0) s = (s + 1) & this.mask;
      slots[2 * s] = lo | 0;
      slots[2 * s + 1] = id + 1;
    }
  }
}

export function growU32(a: Uint32Array, min = 0): Uint32Array {
  const b = new Uint32Array(Math.max(a.length * 2, min, 16));
  b.set(a);
  return b;
}
