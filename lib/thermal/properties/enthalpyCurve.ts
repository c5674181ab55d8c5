/**
 * A specific-enthalpy curve h(T), J/kg, as a monotone piecewise-linear table. A phase change at one
 * temperature appears as two points with equal T and different h (a plateau). Beyond the ends the
 * curve continues with the end slopes. T(h) is its inverse; dT/dh is 0 on a plateau.
 */
export class EnthalpyCurve {
  /** dT/dh when the curve is one straight line (constant specific heat), else NaN: lets solvers skip the table. */
  readonly constantSlope: number;

  constructor(
    readonly T: Float64Array,
    readonly H: Float64Array,
  ) {
    if (T.length < 2 || T.length !== H.length) throw new Error("an enthalpy curve needs at least two points");
    for (let i = 1; i < T.length; i++) {
      if (!(T[i]! >= T[i - 1]!) || !(H[i]! > H[i - 1]!)) throw new Error("an enthalpy curve must increase");
    }
    this.constantSlope = T.length === 2 ? (T[1]! - T[0]!) / (H[1]! - H[0]!) : Number.NaN;
  }

  private segmentByH(h: number): number {
    const H = this.H;
    const n = H.length;
    if (h <= H[1]!) return 0;
    if (h >= H[n - 2]!) return n - 2;
    let lo = 1, hi = n - 2;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (H[mid]! <= h) lo = mid;
      else hi = mid;
    }
    return lo;
  }

  private segmentByT(t: number): number {
    const T = this.T;
    const n = T.length;
    if (t <= T[1]!) return 0;
    if (t >= T[n - 2]!) return n - 2;
    let lo = 1, hi = n - 2;
    while (hi - lo > 1) {
      const mid = (lo + hi) >> 1;
      if (T[mid]! <= t) lo = mid;
      else hi = mid;
    }
    return lo;
  }

  /** h at T; on a plateau temperature, the lower end (the solid state). */
  hAt(t: number): number {
    const i = this.segmentByT(t);
    const T0 = this.T[i]!, T1 = this.T[i + 1]!;
    if (T1 === T0) return this.H[i]!;
    return this.H[i]! + ((this.H[i + 1]! - this.H[i]!) * (t - T0)) / (T1 - T0);
  }

  tAt(h: number): number {
    const i = this.segmentByH(h);
    const H0 = this.H[i]!;
    return this.T[i]! + ((this.T[i + 1]! - this.T[i]!) * (h - H0)) / (this.H[i + 1]! - H0);
  }

  /** dT/dh at h, K·kg/J (0 on a plateau). */
  slopeAt(h: number): number {
    const i = this.segmentByH(h);
    return (this.T[i + 1]! - this.T[i]!) / (this.H[i + 1]! - this.H[i]!);
  }
}
