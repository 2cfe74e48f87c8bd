/**
 * Views of the first n entries of one buffer, each made the first time n is asked for and
 * kept: a batch whose size changes (a population that shrinks, Nelder–Mead's single
 * points between whole simplices) gets an array of its exact length without a new view
 * per batch. At most one view per size up to the largest population (MAX_POPULATION).
 */
export class PrefixViews {
  private buffer = new Float64Array(0);
  private views: Float64Array[] = [];

  /** The first `n` entries (n ≥ 0); the buffer grows, and the views are made afresh, when n exceeds it. */
  get(n: number): Float64Array {
    let view = this.views[n] as Float64Array | undefined;
    if (view === undefined) {
      if (this.buffer.length < n) {
        this.buffer = new Float64Array(n);
        this.views = [];
      }
      view = this.buffer.subarray(0, n);
      this.views[n] = view;
    }
    return view;
  }
}
