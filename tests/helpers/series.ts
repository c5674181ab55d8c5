// Exact series solutions of 1-D transient conduction with a convective boundary (Incropera et al.,
// Fundamentals of Heat and Mass Transfer, §5.5–5.6): θ* = Σ Cn·exp(−ζn²·Fo)·f(ζn·x*), with the
// eigenvalue equations and coefficients below. Roots are computed here, not looked up.

/** Bessel function of the first kind by its integral form, J_n(x) = (1/π)∫₀^π cos(nτ − x·sin τ) dτ (trapezoid rule, spectrally accurate). */
export function besselJ(n: number, x: number): number {
  const m = 400;
  let s = 0;
  for (let i = 0; i <= m; i++) {
    const tau = (Math.PI * i) / m;
    const w = i === 0 || i === m ? 0.5 : 1;
    s += w * Math.cos(n * tau - x * Math.sin(tau));
  }
  return s / m;
}

function bisect(f: (z: number) => number, a: number, b: number): number {
  let fa = f(a);
  for (let i = 0; i < 200; i++) {
    const m = (a + b) / 2;
    const fm = f(m);
    if (fa * fm <= 0) b = m;
    else {
      a = m;
      fa = fm;
    }
    if (b - a < 1e-15 * Math.max(1, Math.abs(m))) break;
  }
  return (a + b) / 2;
}

export type Kind = "slab" | "cylinder" | "sphere";

/** First `count` eigenvalues ζn for Biot number bi (based on half-thickness or radius). */
const cache = new Map<string, number[]>();

export function eigenvalues(kind: Kind, bi: number, count: number): number[] {
  const key = `${kind}:${bi}:${count}`;
  const hit = cache.get(key);
  if (hit) return hit;
  const roots = computeEigenvalues(kind, bi, count);
  cache.set(key, roots);
  return roots;
}

function computeEigenvalues(kind: Kind, bi: number, count: number): number[] {
  const roots: number[] = [];
  if (kind === "slab") {
    for (let n = 0; n < count; n++) roots.push(bisect((z) => z * Math.sin(z) - bi * Math.cos(z), n * Math.PI + 1e-12, n * Math.PI + Math.PI / 2 - 1e-12));
  } else if (kind === "sphere") {
    // 1 − ζ·cot ζ = Bi  ⇔  (1 − Bi)·sin ζ − ζ·cos ζ = 0, one root in each (nπ, (n+1)π)
    for (let n = 0; n < count; n++) roots.push(bisect((z) => (1 - bi) * Math.sin(z) - z * Math.cos(z), n * Math.PI + 1e-9, (n + 1) * Math.PI - 1e-9));
  } else {
    const f = (z: number) => z * besselJ(1, z) - bi * besselJ(0, z);
    let a = 1e-9;
    const h = 0.05; // roots of ζ·J1 − Bi·J0 are about π apart
    while (roots.length < count) {
      const b = a + h;
      if (f(a) * f(b) <= 0) roots.push(bisect(f, a, b));
      a = b;
    }
  }
  return roots;
}

export function coefficient(kind: Kind, z: number): number {
  if (kind === "slab") return (4 * Math.sin(z)) / (2 * z + Math.sin(2 * z));
  if (kind === "sphere") return (4 * (Math.sin(z) - z * Math.cos(z))) / (2 * z - Math.sin(2 * z));
  const j0 = besselJ(0, z), j1 = besselJ(1, z);
  return ((2 / z) * j1) / (j0 * j0 + j1 * j1);
}

/**
 * Centre θ* = (T − T∞)/(Ti − T∞) at Fourier number fo. With 60 terms the first neglected term is
 * below exp(−(60π)²·0.06), far beyond double precision, for every Fo used in the tests.
 */
export function centreTheta(kind: Kind, bi: number, fo: number, terms = 60): number {
  const zs = eigenvalues(kind, bi, terms);
  return zs.reduce((s, z) => s + coefficient(kind, z) * Math.exp(-z * z * fo), 0);
}
