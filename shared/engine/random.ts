/**
 * Random streams.
 *
 * Generator: xoshiro128** 1.1 (Blackman and Vigna), 32-bit state words, pure 32-bit
 * integer operations (Math.imul, shifts), so it runs the same in Node and in a browser.
 * Seeding: SplitMix64, as its authors recommend for filling a xoshiro state, written in
 * 32-bit halves so no BigInt is needed on any path.
 *
 * A study's trials are cut into fixed blocks (BLOCK_SIZE trials). Block b draws from
 * its own stream, seeded from (seed, b) only, so the numbers do not depend on which
 * thread runs which block.
 */

export const BLOCK_SIZE = 4096;

/** 64-bit value as two unsigned 32-bit halves. */
export interface U64 {
  hi: number;
  lo: number;
}

/** (a · b) mod 2^64 for 64-bit a, b given as halves. */
function mul64(ahi: number, alo: number, bhi: number, blo: number, out: U64): void {
  // full 32x32 -> 64 product of the low words through 16-bit limbs
  const a0 = alo & 0xffff,
    a1 = alo >>> 16;
  const b0 = blo & 0xffff,
    b1 = blo >>> 16;
  const p00 = a0 * b0;
  const p01 = a0 * b1;
  const p10 = a1 * b0;
  const p11 = a1 * b1;
  const mid = (p00 >>> 16) + (p01 & 0xffff) + (p10 & 0xffff);
  const lo = ((mid & 0xffff) << 16) | (p00 & 0xffff);
  const carryHi = p11 + (p01 >>> 16) + (p10 >>> 16) + (mid >>> 16);
  const hi = (carryHi + Math.imul(alo, bhi) + Math.imul(ahi, blo)) >>> 0;
  out.hi = hi;
  out.lo = lo >>> 0;
}

/** SplitMix64 (Steele, Lea, Flood; constants as published by Vigna). */
export class SplitMix64 {
  hi: number;
  lo: number;
  private readonly t: U64 = { hi: 0, lo: 0 };

  constructor(hi: number, lo: number) {
    this.hi = hi >>> 0;
    this.lo = lo >>> 0;
  }

  /** Next 64-bit output, written into out. */
  next(out: U64): U64 {
    // x += 0x9e3779b97f4a7c15
    const lo = (this.lo + 0x7f4a7c15) >>> 0;
    const carry = lo < this.lo ? 1 : 0;
    this.lo = lo;
    this.hi = (this.hi + 0x9e3779b9 + carry) >>> 0;
    let zh = this.hi,
      zl = this.lo;
    // z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
    zl = (zl ^ ((zl >>> 30) | (zh << 2))) >>> 0;
    zh = (zh ^ (zh >>> 30)) >>> 0;
    mul64(zh, zl, 0xbf58476d, 0x1ce4e5b9, this.t);
    zh = this.t.hi;
    zl = this.t.lo;
    // z = (z ^ (z >> 27)) * 0x94d049bb133111eb
    zl = (zl ^ ((zl >>> 27) | (zh << 5))) >>> 0;
    zh = (zh ^ (zh >>> 27)) >>> 0;
    mul64(zh, zl, 0x94d049bb, 0x133111eb, this.t);
    zh = this.t.hi;
    zl = this.t.lo;
    // z ^ (z >> 31)
    out.lo = (zl ^ ((zl >>> 31) | (zh << 1))) >>> 0;
    out.hi = (zh ^ (zh >>> 31)) >>> 0;
    return out;
  }
}

/** xoshiro128** 1.1. State words are kept as int32; outputs are unsigned. */
export class Xoshiro128ss {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;

  constructor(s0: number, s1: number, s2: number, s3: number) {
    this.s0 = s0 | 0;
    this.s1 = s1 | 0;
    this.s2 = s2 | 0;
    this.s3 = s3 | 0;
    if ((this.s0 | this.s1 | this.s2 | this.s3) === 0) this.s0 = 1; // the all-zero state is a fixed point
  }

  nextU32(): number {
    const s1 = this.s1;
    const m = Math.imul(s1, 5);
    const result = Math.imul((m << 7) | (m >>> 25), 9) >>> 0;
    const t = s1 << 9;
    this.s2 ^= this.s0;
    this.s3 ^= s1;
    this.s1 = s1 ^ this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = (this.s3 << 11) | (this.s3 >>> 21);
    return result;
  }

  /**
   * Uniform on the open interval (0, 1) with 53 random bits (two outputs), so the
   * inverse normal CDF reaches past 8 sigma and never sees 0 or 1.
   */
  nextOpen01(): number {
    const a = this.nextU32() >>> 5; // 27 bits
    const b = this.nextU32() >>> 6; // 26 bits
    return (a * 67108864 + b + 0.5) / 9007199254740992;
  }

  /**
   * n open uniforms (as nextOpen01) into out, with the state in locals: the trial loop
   * calls this once per trial, so no double crosses a call boundary (which would box it).
   */
  fillOpen01(out: Float64Array, n: number): void {
    let s0 = this.s0,
      s1 = this.s1,
      s2 = this.s2,
      s3 = this.s3;
    for (let i = 0; i < n; i++) {
      let m = Math.imul(s1, 5);
      const ra = Math.imul((m << 7) | (m >>> 25), 9) >>> 5;
      let t = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t;
      s3 = (s3 << 11) | (s3 >>> 21);
      m = Math.imul(s1, 5);
      const rb = Math.imul((m << 7) | (m >>> 25), 9) >>> 6;
      t = s1 << 9;
      s2 ^= s0;
      s3 ^= s1;
      s1 ^= s2;
      s0 ^= s3;
      s2 ^= t;
      s3 = (s3 << 11) | (s3 >>> 21);
      out[i] = (ra * 67108864 + rb + 0.5) / 9007199254740992;
    }
    this.s0 = s0;
    this.s1 = s1;
    this.s2 = s2;
    this.s3 = s3;
  }

  /** Skip n outputs of nextU32. */
  skip(n: number): void {
    for (let i = 0; i < n; i++) this.nextU32();
  }

  /** The authors' jump(): equivalent to 2^64 calls of nextU32. */
  jump(): void {
    const J = [0x8764000b, 0xf542d2d3, 0x6fa035c3, 0x77f2db5b];
    let t0 = 0,
      t1 = 0,
      t2 = 0,
      t3 = 0;
    for (let i = 0; i < 4; i++) {
      for (let b = 0; b < 32; b++) {
        if ((J[i] >>> b) & 1) {
          t0 ^= this.s0;
          t1 ^= this.s1;
          t2 ^= this.s2;
          t3 ^= this.s3;
        }
        this.nextU32();
      }
    }
    this.s0 = t0;
    this.s1 = t1;
    this.s2 = t2;
    this.s3 = t3;
  }

  state(): [number, number, number, number] {
    return [this.s0 >>> 0, this.s1 >>> 0, this.s2 >>> 0, this.s3 >>> 0];
  }
}

/** Split a non-negative safe integer seed into 64-bit halves. */
export function seedHalves(seed: number): U64 {
  if (!Number.isSafeInteger(seed) || seed < 0) throw new RangeError(`seed must be a non-negative safe integer, got ${seed}`);
  return { hi: Math.floor(seed / 4294967296) >>> 0, lo: seed >>> 0 };
}

/**
 * The stream of block `block` of a study with seed `seed`.
 * key = first SplitMix64 output from the seed; the block's SplitMix64 starts at
 * key + block·2^32 (block in the high word): distinct blocks of one seed are never the
 * same SplitMix64 state or one step apart (2^32·k is never ±γ), so their xoshiro states
 * are unrelated. Two SplitMix64 outputs fill the four xoshiro words.
 */
export function blockStream(seed: number, block: number): Xoshiro128ss {
  const { hi, lo } = seedHalves(seed);
  const tmp: U64 = { hi: 0, lo: 0 };
  new SplitMix64(hi, lo).next(tmp);
  const sm = new SplitMix64((tmp.hi + block) >>> 0, tmp.lo);
  const p: U64 = { hi: 0, lo: 0 };
  const q: U64 = { hi: 0, lo: 0 };
  sm.next(p);
  sm.next(q);
  return new Xoshiro128ss(p.lo, p.hi, q.lo, q.hi);
}
