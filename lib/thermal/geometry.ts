import type { Shape } from "./definitions";

/** The 1-D geometry a conduction model solves: heat flows along one coordinate from the surface to a centre. */
export interface ConductionGeometry {
  kind: "slab" | "cylinder" | "sphere";
  /** half-thickness (slab) or outer radius (cylinder, sphere), m */
  half_m: number;
  /** slab: face area on one side, m² (both faces exchange heat); cylinder: length, m; sphere: unused */
  extent: number;
  /** how a box was mapped, when it was */
  note?: string;
}

export interface Geometry {
  volume_m3: number;
  /** surface area exchanging heat, m² */
  area_m2: number;
  /** characteristic length V/A, m */
  lc_m: number;
  conduction: ConductionGeometry;
}

/**
 * Volume, surface and the 1-D conduction geometry of a shape. Cylinders and slabs are treated as
 * "long" in the 1-D model (heat through the curved side, or the two large faces); their end areas are
 * still counted in A for the lumped model. A box is conducted as a slab across its smallest side when
 * that side is at most a third of the next one, otherwise as the sphere with the same V/A (r0 = 3V/A);
 * both are approximations and are reported as such.
 */
export function shapeGeometry(shape: Shape): Geometry {
  switch (shape.kind) {
    case "sphere": {
      const r = shape.radius_m;
      const V = (4 / 3) * Math.PI * r ** 3;
      const A = 4 * Math.PI * r ** 2;
      return { volume_m3: V, area_m2: A, lc_m: V / A, conduction: { kind: "sphere", half_m: r, extent: 0 } };
    }
    case "cylinder": {
      const { radius_m: r, length_m: L } = shape;
      const V = Math.PI * r * r * L;
      const A = 2 * Math.PI * r * L + 2 * Math.PI * r * r;
      return { volume_m3: V, area_m2: A, lc_m: V / A, conduction: { kind: "cylinder", half_m: r, extent: L } };
    }
    case "slab": {
      const { thickness_m: t, width_m: w, length_m: L } = shape;
      const V = t * w * L;
      const A = 2 * (w * L + t * w + t * L);
      return { volume_m3: V, area_m2: A, lc_m: V / A, conduction: { kind: "slab", half_m: t / 2, extent: w * L } };
    }
    case "box": {
      const [a, b, c] = [shape.x_m, shape.y_m, shape.z_m].sort((p, q) => p - q) as [number, number, number];
      const V = a * b * c;
      const A = 2 * (a * b + b * c + a * c);
      const conduction: ConductionGeometry =
        a <= b / 3
          ? { kind: "slab", half_m: a / 2, extent: b * c, note: `box conducted as a slab ${fmtMm(a)} thick` }
          : { kind: "sphere", half_m: (3 * V) / A, extent: 0, note: `box conducted as a sphere of equal V/A (radius ${fmtMm((3 * V) / A)})` };
      return { volume_m3: V, area_m2: A, lc_m: V / A, conduction };
    }
  }
}

const fmtMm = (m: number) => `${Number((m * 1000).toPrecision(3))} mm`;

/** Volume of the conduction body (per its 1-D idealisation), m³. */
export function conductionVolume(g: ConductionGeometry): number {
  if (g.kind === "slab") return 2 * g.half_m * g.extent;
  if (g.kind === "cylinder") return Math.PI * g.half_m ** 2 * g.extent;
  return (4 / 3) * Math.PI * g.half_m ** 3;
}

/** Area through which heat crosses the conduction body's surface, m². */
export function conductionSurface(g: ConductionGeometry): number {
  if (g.kind === "slab") return 2 * g.extent;
  if (g.kind === "cylinder") return 2 * Math.PI * g.half_m * g.extent;
  return 4 * Math.PI * g.half_m ** 2;
}

/** Area of the surface at distance r from the centre (r ≤ half_m), m², for the whole body. */
export function areaAt(g: ConductionGeometry, r: number): number {
  if (g.kind === "slab") return 2 * g.extent;
  if (g.kind === "cylinder") return 2 * Math.PI * r * g.extent;
  return 4 * Math.PI * r * r;
}

/** Volume between the centre and distance r, m³. */
export function volumeWithin(g: ConductionGeometry, r: number): number {
  if (g.kind === "slab") return 2 * r * g.extent;
  if (g.kind === "cylinder") return Math.PI * r * r * g.extent;
  return (4 / 3) * Math.PI * r ** 3;
}
