// Which slot of one score index holds the same original id as a slot of another.
import { compareBytes, compareU64 } from "./id-order";
import { parseU64, type IdBlock, type ScoreIndex } from "./read";

async function nextBlock(blocks: AsyncGenerator<IdBlock>): Promise<IdBlock | null> {
  const step = await blocks.next();
  return step.done ? null : step.value;
}

/** Merge pass over two id tables of one kind, both ascending: O(n_a + n_b), a block of each in memory. */
async function mergeJoin(a: ScoreIndex, b: ScoreIndex, match: Int32Array): Promise<void> {
  const blocksA = a.idBlocks();
  const blocksB = b.idBlocks();
  let ba = await nextBlock(blocksA);
  let bb = await nextBlock(blocksB);
  let i = 0;
  let j = 0;
  while (ba && bb) {
    if (ba.kind === "integer" && bb.kind === "integer") {
      const wa = ba.words;
      const wb = bb.words;
      while (i < ba.count && j < bb.count) {
        const c = compareU64(wa[2 * i + 1], wa[2 * i], wb[2 * j + 1], wb[2 * j]);
        if (c === 0) match[ba.start + i++] = bb.start + j++;
        else if (c < 0) i++;
        else j++;
      }
    } else if (ba.kind === "string" && bb.kind === "string") {
      const { offsets: oa, bytes: ya, base: pa } = ba;
      const { offsets: ob, bytes: yb, base: pb } = bb;
      while (i < ba.count && j < bb.count) {
        const c = compareBytes(ya, oa[i] - pa, oa[i + 1] - pa, yb, ob[j] - pb, ob[j + 1] - pb);
        if (c === 0) match[ba.start + i++] = bb.start + j++;
        else if (c < 0) i++;
        else j++;
      }
    } else throw new Error("mergeJoin: id kinds differ");
    if (i === ba.count) {
      ba = await nextBlock(blocksA);
      i = 0;
    }
    if (j === bb.count) {
      bb = await nextBlock(blocksB);
      j = 0;
    }
  }
  await blocksA.return(undefined);
  await blocksB.return(undefined);
}

const DIGIT_0 = 48;
const DIGIT_9 = 57;

/** Integer ids against string ids, by text: a string matches when it is the integer's canonical decimal form. */
async function mixedJoin(ints: ScoreIndex, strings: ScoreIndex, onMatch: (intSlot: number, stringSlot: number) => void): Promise<void> {
  const values = await ints.integerIds();
  const words = new Uint32Array(values.buffer, values.byteOffset, 2 * values.length);
  for await (const block of strings.idBlocks()) {
    if (block.kind !== "string") throw new Error("mixedJoin: string index expected");
    for (let i = 0; i < block.count; i++) {
      const s = block.offsets[i] - block.base;
      const e = block.offsets[i + 1] - block.base;
      if (e - s < 1 || e - s > 20 || (e - s > 1 && block.bytes[s] === DIGIT_0)) continue;
      let digits = true;
      for (let p = s; p < e && digits; p++) digits = block.bytes[p] >= DIGIT_0 && block.bytes[p] <= DIGIT_9;
      if (!digits) continue;
      const value = parseU64(Buffer.from(block.bytes.buffer, block.bytes.byteOffset + s, e - s).toString("latin1"));
      if (value === null) continue;
      const hi = Number(value >> 32n);
      const lo = Number(value & 0xffffffffn);
      let a = 0;
      let b = values.length;
      while (a < b) {
        const mid = (a + b) >>> 1;
        const c = compareU64(words[2 * mid + 1], words[2 * mid], hi, lo);
        if (c === 0) {
          onMatch(mid, block.start + i);
          break;
        }
        if (c < 0) a = mid + 1;
        else b = mid;
      }
    }
  }
}

export interface SlotMatch {
  /** match[sa] = slot of b with the same id as slot sa of a, or −1; null when both indexes hold the same id table. */
  match: Int32Array | null;
  /** True when matched slots of b increase with the slots of a (sequential reads of b pay). */
  monotone: boolean;
}

/**
 * Pairs the slots of two indexes by original id (integer ids as decimal text against string ids). Equal digests
 * mean equal id tables: no pass at all.
 * @example const { match } = await matchSlots(a, b) // null when a and b rank the same node set
 */
export async function matchSlots(a: ScoreIndex, b: ScoreIndex): Promise<SlotMatch> {
  if (a.kind === b.kind && a.n === b.n && a.digest === b.digest) return { match: null, monotone: true };
  const match = new Int32Array(a.n).fill(-1);
  if (a.kind === b.kind) {
    await mergeJoin(a, b, match);
    return { match, monotone: true };
  }
  if (a.kind === "integer") await mixedJoin(a, b, (intSlot, stringSlot) => (match[intSlot] = stringSlot));
  else await mixedJoin(b, a, (intSlot, stringSlot) => (match[stringSlot] = intSlot));
  return { match, monotone: false };
}
