// What the residual capacities were before the current round of augmentations, for the pairs
// the round changed, so that the previous round's residual can be rebuilt at the end instead of
// being copied after every round. The evacuation curve needs the residual of the horizon before
// clearance (its minimum cut is what holds the last arrivals back), but learns which horizon that
// was only when the next one clears; copying the residual after every horizon cost about
// E·T/2 entries in all. With the log the cost is one entry per arc pair an augmentation touches
// in the round, which the augmentation pays for anyway, plus one copy of the residual at the end.

export class ResidualUndoLog {
  /** Bit r set where the pair of residual arc r already has its earlier values logged this round (a bit per arc: 0.25 bytes per arc pair). */
  private readonly logged: Uint32Array;
  private arcs: Int32Array;
  private before: Int32Array; // two per entry: residual[a], residual[mate[a]]
  private count = 0;

  constructor(
    private readonly mate: Int32Array,
    private readonly residual: Int32Array,
  ) {
    this.logged = new Uint32Array((residual.length + 31) >>> 5);
    this.arcs = new Int32Array(1024);
    this.before = new Int32Array(2048);
  }

  /** Call before residual[a] or residual[mate[a]] changes: keeps the pair's values as they were when the round began. */
  note(a: number): void {
    const { logged } = this;
    if ((logged[a >>> 5]! & (1 << (a & 31))) !== 0) return;
    const m = this.mate[a]!;
    logged[a >>> 5]! |= 1 << (a & 31);
    logged[m >>> 5]! |= 1 << (m & 31);
    if (this.count === this.arcs.length) this.grow();
    this.arcs[this.count] = a;
    this.before[2 * this.count] = this.residual[a]!;
    this.before[2 * this.count + 1] = this.residual[m]!;
    this.count++;
  }

  /** Starts a new round: what changes from now on is logged against the residual as it is now. */
  startRound(): void {
    const { logged, mate, arcs } = this;
    for (let i = 0; i < this.count; i++) {
      const a = arcs[i]!;
      const m = mate[a]!;
      logged[a >>> 5]! &= ~(1 << (a & 31));
      logged[m >>> 5]! &= ~(1 << (m & 31));
    }
    this.count = 0;
  }

  /** Writes the round's starting values into `target` (a copy of the residual as it is now). */
  undoInto(target: Int32Array): void {
    const { mate, arcs, before } = this;
    for (let i = 0; i < this.count; i++) {
      const a = arcs[i]!;
      target[a] = before[2 * i]!;
      target[mate[a]!] = before[2 * i + 1]!;
    }
  }

  /** Arc pairs logged in this round. */
  get size(): number {
    return this.count;
  }

  private grow(): void {
    const arcs = new Int32Array(this.arcs.length * 2);
    arcs.set(this.arcs);
    const before = new Int32Array(this.before.length * 2);
    before.set(this.before);
    this.arcs = arcs;
    this.before = before;
  }
}
