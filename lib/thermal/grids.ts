import type { ConductionGeometry } from "./geometry";
import { volumeWithin } from "./geometry";

/**
 * The product part of a conduction model as a graph: control volumes (nodes), conductances between
 * them per unit conductivity, and the faces through which the product exchanges heat with what
 * surrounds it. All quantities are for the whole body (symmetric parts are multiplied out), so the
 * energy balance is the whole product's.
 */
export interface ProductGrid {
  /** what the grid is, for the review ("3-D box, one octant, 11×11×11 nodes") */
  label: string;
  /** volume share of each node (sums to 1); node masses are mass_kg × share */
  share: Float64Array;
  edgeA: Int32Array;
  edgeB: Int32Array;
  /** conductance per unit conductivity, m: g = k·shape (k at the mean of the two node temperatures) */
  edgeShape: Float64Array;
  /** nodes on the surface, the whole-body area each one exposes, m², and its half-cell resistance × k, 1/m */
  faceNode: Int32Array;
  faceArea: Float64Array;
  faceHalfR: Float64Array;
  /** node at the thermal centre; for cell-centred shells the core is extrapolated from the two innermost */
  core: number;
  cellCentredShells: boolean;
}

/** Node positions 0, h, 2h, …, half (vertex-centred) and their control-volume widths (h/2 at both ends). */
function axis(half_m: number, n: number): { h: number; width: Float64Array } {
  const h = half_m / n;
  const width = new Float64Array(n + 1).fill(h);
  width[0] = h / 2;
  width[n] = h / 2;
  return { h, width };
}

class Builder {
  readonly a: number[] = [];
  readonly b: number[] = [];
  readonly s: number[] = [];
  readonly faceArea: Map<number, number> = new Map();
  edge(i: number, j: number, shape: number) {
    this.a.push(i);
    this.b.push(j);
    this.s.push(shape);
  }
  face(i: number, area: number) {
    this.faceArea.set(i, (this.faceArea.get(i) ?? 0) + area);
  }
  done(label: string, share: Float64Array, core: number): ProductGrid {
    const nodes = [...this.faceArea.keys()].sort((x, y) => x - y);
    return {
      label,
      share,
      edgeA: Int32Array.from(this.a),
      edgeB: Int32Array.from(this.b),
      edgeShape: Float64Array.from(this.s),
      faceNode: Int32Array.from(nodes),
      faceArea: Float64Array.from(nodes, (i) => this.faceArea.get(i)!),
      faceHalfR: new Float64Array(nodes.length),
      core,
      cellCentredShells: false,
    };
  }
}

/**
 * A box of half-lengths hx, hy, hz by vertex-centred finite volumes on one octant (the three
 * mid-planes are planes of symmetry: no flux), n intervals per axis, node (0,0,0) at the centre.
 * Second order in space; the faces of the octant's outer planes exchange heat.
 */
export function boxGrid(hx: number, hy: number, hz: number, n: number): ProductGrid {
  const X = axis(hx, n), Y = axis(hy, n), Z = axis(hz, n);
  const m = n + 1;
  const id = (i: number, j: number, k: number) => i + m * (j + m * k);
  const share = new Float64Array(m * m * m);
  const bld = new Builder();
  const V = hx * hy * hz;
  for (let k = 0; k < m; k++) {
    for (let j = 0; j < m; j++) {
      for (let i = 0; i < m; i++) {
        const wx = X.width[i]!, wy = Y.width[j]!, wz = Z.width[k]!;
        const me = id(i, j, k);
        share[me] = (wx * wy * wz) / V;
        // ×8: the octant stands for the whole box
        if (i < n) bld.edge(me, id(i + 1, j, k), (8 * wy * wz) / X.h);
        if (j < n) bld.edge(me, id(i, j + 1, k), (8 * wx * wz) / Y.h);
        if (k < n) bld.edge(me, id(i, j, k + 1), (8 * wx * wy) / Z.h);
        if (i === n) bld.face(me, 8 * wy * wz);
        if (j === n) bld.face(me, 8 * wx * wz);
        if (k === n) bld.face(me, 8 * wx * wy);
      }
    }
  }
  return bld.done(`3-D box, one octant by symmetry, ${m}×${m}×${m} nodes`, share, id(0, 0, 0));
}

/**
 * A finite cylinder (radius r0, length L) by vertex-centred finite volumes in r and z on the half
 * above the mid-plane (axisymmetric; the mid-plane is a plane of symmetry). nr and nz intervals;
 * radial faces at the mid-radii between nodes (2π·r_face·Δz/Δr per unit k), node (0,0) at the centre.
 */
export function cylinderGrid(r0: number, length_m: number, nr: number, nz: number): ProductGrid {
  const R = axis(r0, nr), Z = axis(length_m / 2, nz);
  const mr = nr + 1, mz = nz + 1;
  const id = (i: number, k: number) => i + mr * k;
  const share = new Float64Array(mr * mz);
  const bld = new Builder();
  const V = Math.PI * r0 * r0 * (length_m / 2);
  for (let k = 0; k < mz; k++) {
    for (let i = 0; i < mr; i++) {
      const rIn = Math.max(0, (i - 0.5) * R.h), rOut = Math.min(r0, (i + 0.5) * R.h);
      const ring = Math.PI * (rOut * rOut - rIn * rIn);
      const wz = Z.width[k]!;
      const me = id(i, k);
      share[me] = (ring * wz) / V;
      // ×2: the upper half stands for the whole cylinder
      if (i < nr) bld.edge(me, id(i + 1, k), (2 * 2 * Math.PI * (i + 0.5) * R.h * wz) / R.h);
      if (k < nz) bld.edge(me, id(i, k + 1), (2 * ring) / Z.h);
      if (i === nr) bld.face(me, 2 * 2 * Math.PI * r0 * wz);
      if (k === nz) bld.face(me, 2 * ring);
    }
  }
  return bld.done(`finite cylinder in r and z, half by symmetry, ${mr}×${mz} nodes`, share, id(0, 0));
}

/** Conduction resistance × k between radii r1 < r2 of a 1-D body, 1/m (plane, cylindrical, spherical). */
export function shellShape(g: ConductionGeometry, r1: number, r2: number): number {
  if (g.kind === "slab") return (r2 - r1) / (2 * g.extent);
  if (g.kind === "cylinder") return Math.log(r2 / r1) / (2 * Math.PI * g.extent);
  return (1 / r1 - 1 / r2) / (4 * Math.PI);
}

/**
 * The 1-D model (slab across its thickness, long cylinder, sphere) as a grid: `shells` cell-centred
 * shells of equal thickness, node 0 outermost, one face of the given area (the product's area, ends
 * and edges included, as in the chain model) behind half a shell.
 */
export function shellGrid(g: ConductionGeometry, shells: number, area_m2: number): ProductGrid {
  const R = g.half_m, dr = R / shells;
  const radii = Float64Array.from({ length: shells }, (_, j) => R - j * dr - dr / 2);
  const total = volumeWithin(g, R);
  const share = Float64Array.from({ length: shells }, (_, j) => (volumeWithin(g, R - j * dr) - volumeWithin(g, Math.max(R - (j + 1) * dr, 0))) / total);
  const bld = new Builder();
  for (let j = 0; j < shells - 1; j++) bld.edge(j, j + 1, 1 / shellShape(g, radii[j + 1]!, radii[j]!));
  bld.face(0, area_m2);
  const grid = bld.done(`1-D ${g.kind}, ${shells} shells`, share, shells - 1);
  grid.faceHalfR[0] = shellShape(g, radii[0]!, R);
  grid.cellCentredShells = true;
  return grid;
}

/** One node for the whole product (lumped). */
export function lumpedGrid(area_m2: number): ProductGrid {
  const bld = new Builder();
  bld.face(0, area_m2);
  return bld.done("lumped", Float64Array.of(1), 0);
}
