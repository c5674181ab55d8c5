// Primary growth model of Baranyi and Roberts (1994), Int. J. Food Microbiol. 23:277–294, with y = ln N:
//   dq/dt = μmax·q,   dy/dt = μmax·q/(1 + q)·(1 − e^(m·(y − ymax))),   m = 1 (the curvature used here).
// Both depend on time only through M(t) = ∫ μmax(T(t)) dt, which integrate.ts gives exactly (square-root
// model) or to 1e-12 relative. With α = q/(1 + q) = q0·e^M/(1 + q0·e^M):
// - no maximum population: y − y0 = ∫ α dM = A(M) = ln((1 + q0·e^M)/(1 + q0)), the same as Baranyi and
//   Roberts' M + ln(e^(−M) + e^(−h0) − e^(−M−h0)) with q0 = 1/(e^h0 − 1);
// - with ymax and m = 1: u = e^(−y) − e^(−ymax) obeys du/dM = −α·u, so e^(−y) = e^(−ymax) + (e^(−y0) −
//   e^(−ymax))·e^(−A), i.e. y − y0 = A − ln(1 + (e^A − 1)·e^(−(ymax − y0))), the closed form of their paper;
//   the tests check it against a fine-step integration of the two differential equations.
// Neither lag_h nor q0: no lag (q0 → ∞, A = M).

/** ln(1 + e^x) without overflow. */
function softplus(x: number): number {
  return x > 0 ? x + Math.log1p(Math.exp(-x)) : Math.log1p(Math.exp(x));
}

/**
 * q0 from a lag time λ (h) measured at constant temperature with rate μmax (1/h): h0 = μmax·λ and
 * q0 = 1/(e^h0 − 1) (Baranyi and Roberts 1994). λ = 0 gives no lag (Infinity).
 */
export function q0FromLag(lag_h: number, mu_per_h: number): number {
  const h0 = mu_per_h * lag_h;
  return h0 === 0 ? Infinity : 1 / Math.expm1(h0);
}

/** Natural-log increase A(M) of the lag-adjusted model without a maximum population. */
export function lagAdjusted(M: number, q0: number): number {
  if (!Number.isFinite(q0)) return M;
  const lq = Math.log(q0);
  return softplus(lq + M) - softplus(lq);
}

/**
 * ln N(t) − ln N0 after an integrated rate M = ∫μmax dt (dimensionless), for physiological state q0
 * (Infinity: no lag) and, optionally, a headroom D = ln Nmax − ln N0 > 0 (the maximum population).
 */
export function lnIncrease(M: number, q0: number, headroom?: number): number {
  const A = lagAdjusted(M, q0);
  if (headroom === undefined) return A;
  // ln(1 + (e^A − 1)·e^(−D)), written to stay finite for large A
  const x = A - headroom;
  const L = x > 30 ? x + Math.log1p(Math.exp(-x) - Math.exp(-A)) : Math.log1p(Math.expm1(A) * Math.exp(-headroom));
  return A - L;
}
