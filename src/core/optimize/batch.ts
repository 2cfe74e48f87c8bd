/** Handed-out arrays kept per buffer: Nelder–Mead alternates between three batch sizes. */
const HANDOUT_SLOTS = 4;

/**
 * The points of one `ask()`: rows of a preallocated buffer, handed out as subarray
 * views that are made once. Two buffers alternate, so a stale batch passed to
 * `tell()` (the views of the batch before) is told apart from the current one.
 */
export class PointBatch {
  /** Number of points asked and not yet told. */
  count = 0;
  private readonly dim: number;
  private readonly buffers: [Float64Array, Float64Array];
  private readonly views: [Float64Array[], Float64Array[]];
  /** Per buffer, arrays of its first views, each of a batch size seen; a new size resizes the next in turn. */
  private readonly handouts: [Float64Array[][], Float64Array[][]] = [[], []];
  private readonly nextSlot = new Int32Array(2);
  private side: 0 | 1 = 0;

  constructor(dim: number, capacity: number) {
    this.dim = dim;
    this.buffers = [new Float64Array(dim * capacity), new Float64Array(dim * capacity)];
    const rows = (buffer: Float64Array): Float64Array[] =>
      Array.from({ length: capacity }, (_, i) => buffer.subarray(i * dim, (i + 1) * dim));
    this.views = [rows(this.buffers[0]), rows(this.buffers[1])];
  }

  /** The rows of the current batch, point k at `[k·dim, (k + 1)·dim)`. */
  get data(): Float64Array {
    return this.buffers[this.side];
  }

  /** Switches to the other buffer for a new batch and returns it to be written. */
  begin(): Float64Array {
    this.side = this.side === 0 ? 1 : 0;
    this.count = 0;
    return this.buffers[this.side];
  }

  /** Publishes the first `count` rows written since `begin()`. */
  commit(count: number): void {
    this.count = count;
  }

  clear(): void {
    this.count = 0;
  }

  /** Views of the pending rows; the array and the views are reused, valid until the next tell. */
  points(): readonly Float64Array[] {
    const side = this.side;
    const n = this.count;
    const slots = this.handouts[side];
    for (let s = 0; s < slots.length; s++) if (slots[s].length === n) return slots[s];
    const views = this.views[side];
    if (slots.length < HANDOUT_SLOTS) {
      const made = views.slice(0, n);
      slots.push(made);
      return made;
    }
    // Resized in place, so a population that shrinks every generation makes no new array.
    const s = this.nextSlot[side];
    this.nextSlot[side] = (s + 1) % HANDOUT_SLOTS;
    const handout = slots[s];
    if (handout.length > n) handout.length = n;
    for (let k = handout.length; k < n; k++) handout.push(views[k]);
    return handout;
  }

  /**
   * Throws unless `points` is the pending batch (the views handed out, or copies with
   * the same coordinates) and `values` (and `violations`, if given) has one entry per point.
   */
  check(points: readonly Float64Array[], values: Float64Array, violations: Float64Array | undefined): void {
    const n = this.count;
    if (points.length !== n) throw new Error(`tell() got ${points.length} points; the last ask() handed out ${n}`);
    if (values.length !== n) throw new Error(`tell() got ${values.length} values for ${n} points`);
    if (violations !== undefined && violations.length !== n) {
      throw new Error(`tell() got ${violations.length} violations for ${n} points`);
    }
    const views = this.views[this.side];
    const data = this.buffers[this.side];
    const d = this.dim;
    for (let k = 0; k < n; k++) {
      const p = points[k];
      if (p === views[k]) continue;
      if (p.length !== d) throw new Error(`tell(): point ${k} has ${p.length} coordinates; expected ${d}`);
      for (let j = 0; j < d; j++) {
        if (p[j] !== data[k * d + j]) throw new Error(`tell(): point ${k} is not the point the last ask() handed out there`);
      }
    }
  }
}
