// Node-sized work arrays of the tree solvers, and a small store that keeps those of a finished
// one-shot solve for the next one.
//
// Why: on a road graph of 10,000 junctions the solve itself takes about 2 ms, and allocating its
// dozen fresh node-sized typed arrays (each a zeroed ArrayBuffer outside the JavaScript heap, whose
// garbage then has to be collected) measured about a third of that. Callers that solve many times
// (the what-if searches, a long-lived worker) reuse the arrays instead; filling a kept array is a
// memset. Only one-shot solves, which hand their arrays back when they return, use the store: a
// resumable solver keeps its arrays for as long as it lives.

/** Where a solver takes its work arrays from. */
export interface WorkArrays {
  /** An Int32Array of `length` entries, every one `fill`. */
  int32(length: number, fill: number): Int32Array;
  /** A Uint8Array of `length` zeros. */
  uint8(length: number): Uint8Array;
}

/** Fresh arrays every time (resumable solvers). */
export const freshWork: WorkArrays = {
  int32: (length, fill) => (fill === 0 ? new Int32Array(length) : new Int32Array(length).fill(fill)),
  uint8: (length) => new Uint8Array(length),
};

/** At most this many bytes of arrays are kept between solves (the oldest are dropped first). */
const MAX_KEPT_BYTES = 64 << 20;
const kept: (Int32Array | Uint8Array)[] = [];
let keptBytes = 0;

function take<T extends Int32Array | Uint8Array>(kind: new (length: number) => T, length: number): T | null {
  for (let k = kept.length - 1; k >= 0; k--) {
    const array = kept[k]!;
    if (array.length === length && array instanceof kind) {
      kept.splice(k, 1);
      keptBytes -= array.byteLength;
      return array as T;
    }
  }
  return null;
}

/**
 * Arrays from the store (or fresh when it holds none of that length), handed back by release().
 * Synchronous use only: a solve takes them, runs to its end and releases them.
 */
export class KeptWork implements WorkArrays {
  private readonly taken: (Int32Array | Uint8Array)[] = [];

  int32(length: number, fill: number): Int32Array {
    const array = take(Int32Array, length);
    if (array) array.fill(fill);
    const result = array ?? freshWork.int32(length, fill);
    this.taken.push(result);
    return result;
  }

  uint8(length: number): Uint8Array {
    const array = take(Uint8Array, length);
    if (array) array.fill(0);
    const result = array ?? new Uint8Array(length);
    this.taken.push(result);
    return result;
  }

  /** Hands every array taken back to the store; the solver must not be used afterwards. */
  release(): void {
    for (const array of this.taken) {
      if (array.byteLength > MAX_KEPT_BYTES) continue;
      kept.push(array);
      keptBytes += array.byteLength;
    }
    this.taken.length = 0;
    while (keptBytes > MAX_KEPT_BYTES) keptBytes -= kept.shift()!.byteLength;
  }
}
