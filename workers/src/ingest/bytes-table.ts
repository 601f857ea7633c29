// Open-addressing map (linear probing) from byte strings (UTF-8 ids) to dense ids 0..size-1 in insertion order.
// Key bytes of id i are arena[offsets[i] .. offsets[i+1]); hashes[i] is compared before the bytes.

import { growU32 } from "./u64-table";

export class BytesTable {
  size = 0;
  arena: Uint8Array;
  /** offsets[0..size] */
  offsets: Uint32Array;
  private hashes: Uint32Array;
  private slots: Int32Array;
  private mask: number;

  constructor(expected = 1024, expectedBytes = expected * 8) {
    let cap = 1024;
    while (cap < expected * 2 && cap < 2 ** 30) cap *= 2;
    this.slots = new Int32Array(cap);
    this.mask = cap - 1;
    this.arena = new Uint8Array(Math.max(1024, expectedBytes));
    this.offsets = new Uint32Array(Math.max(16, expected + 1));
    this.hashes = new Uint32Array(Math.max(16, expected));
  }

  /** Dense id of bytes buf[start..end), inserting when absent. */
  idOf(buf: Uint8Array, start: number, end: number): number {
    const h = hashBytes(buf, start, end);
    let s = h & this.mask;
    for (;;) {
      const tag = this.slots[s];
      if (tag === 0) return this.insertAt(s, h, buf, start, end);
      if (this.hashes[tag - 1] === h && this.equals(tag - 1, buf, start, end)) return tag - 1;
      s = (s + 1) & this.mask;
    }
  }

  find(buf: Uint8Array, start: number, end: number): number {
    const h = hashBytes(buf, start, end);
    let s = h & this.mask;
    for (;;) {
      const tag = this.slots[s];
      if (tag === 0) return -1;
      if (this.hashes[tag - 1] === h && this.equals(tag - 1, buf, start, end)) return tag - 1;
      s = (s + 1) & this.mask;
    }
  }

  keyBytes(id: number): Uint8Array {
    return this.arena.subarray(this.offsets[id], this.offsets[id + 1]);
  }

  /** Exact-size copies of the key bytes and offsets. */
  export(): { bytes: Uint8Array; offsets: Uint32Array } {
    return { bytes: this.arena.slice(0, this.offsets[this.size]), offsets: this.offsets.slice(0, this.size + 1) };
  }

  private equals(id: number, buf: Uint8Array, start: number, end: number): boolean {
    const a = this.offsets[id];
    const len = this.offsets[id + 1] - a;
    if (len !== end - start) return false;
    const arena = this.arena;
    for (let i = 0; i < len; i++) if (arena[a + i] !== buf[start + i]) return false;
    return true;
  }

  private insertAt(s: number, h: number, buf: Uint8Array, start: number, end: number): number {
    const id = this.size++;
    const len = end - start;
    const at = this.offsets[id];
    if (at + len > this.arena.length) {
      const bigger = new Uint8Array(Math.max(this.arena.length * 2, at + len));
      bigger.set(this.arena.subarray(0, at));
      this.arena = bigger;
    }
    this.arena.set(buf.subarray(start, end), at);
    if (id + 2 > this.offsets.length) this.offsets = growU32(this.offsets);
    if (id + 1 > this.hashes.length) this.hashes = growU32(this.hashes);
    this.offsets[id + 1] = at + len;
    this.hashes[id] = h;
    this.slots[s] = id + 1;
    if (this.size * 2 > this.mask + 1) this.rehash();
    return id;
  }

  private rehash(): void {
    const cap = (this.mask + 1) * 2;
    if (cap > 2 ** 31) throw new RangeError("id table is full (over 2^30 distinct ids)");
    this.slots = new Int32Array(cap);
    this.mask = cap - 1;
    for (let id = 0; id < this.size; id++) {
      let s = this.hashes[id] & this.mask;
      while (this.slots[s] !== 0) s = (s + 1) & this.mask;
      this.slots[s] = id + 1;
    }
  }
}

/** 32-bit FNV-1a over the bytes, finished with a multiplicative mix so that low bits are usable as a slot index. */
export function hashBytes(buf: Uint8Array, start: number, end: number): number {
  let h = 0x811c9dc5;
  for (let i = start; i < end; i++) h = Math.imul(h ^ buf[i], 0x01000193);
  h ^= h >>> 15;
  h = Math.imul(h, 0x2c1b3c6d);
  return (h ^ (h >>> 12)) >>> 0;
}
