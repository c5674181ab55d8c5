import type { Pack, Product } from "./definitions";
import type { Geometry } from "./geometry";

/** Stefan–Boltzmann constant, W/(m²·K⁴) (CODATA 2018). */
export const STEFAN_BOLTZMANN = 5.670374419e-8;

export interface ResistanceItem {
  name: string;
  kind: "outer film" | "layer" | "inner film";
  r_K_W: number;
  /** fraction of R_total */
  share: number;
}

export interface Resistances {
  items: ResistanceItem[];
  /** ambient to product surface, K/W */
  r_total_K_W: number;
  /** ambient to the inner air (outer film and layers), K/W: where coolant sits */
  r_wall_K_W: number;
  /** inner air to product surface (inner film), K/W */
  r_inner_K_W: number;
  /** overall coefficient referred to the product surface, W/(m²·K) */
  u_product_W_m2K: number;
  /** radiative coefficient used in the outer film, W/(m²·K) */
  h_radiation_W_m2K: number;
  wall: "plane" | "spherical shell" | "cylindrical shell" | "none";
  /** area of the outside film, m² (the pack's outer surface, or the product's without a pack) */
  outer_area_m2: number;
  /** outside convective coefficient, W/(m²·K), and emissivity (0 without radiation) */
  h_outside_W_m2K: number;
  emissivity: number;
  /** each wall layer, outside in: its resistance and its volume (for layers that store heat), m³ */
  layers: Array<{ r_K_W: number; volume_m3: number }>;
}

/**
 * Radiative coefficient between a surface at ts_C and surroundings at ta_C (taken to be the air),
 * h_r = ε·σ·(Ts² + Ta²)·(Ts + Ta) in kelvin: exact for a small grey body in large surroundings
 * (Incropera et al., §1.2.3, eq. 1.9). With Ts = Ta = T_m it is the linearised 4·ε·σ·T_m³.
 */
export function radiationCoefficient(emissivity: number, ts_C: number, ta_C: number): number {
  const s = ts_C + 273.15, a = ta_C + 273.15;
  return emissivity * STEFAN_BOLTZMANN * (s * s + a * a) * (s + a);
}

/**
 * Series resistances from the air to the product surface: the outer film (convection plus radiation
 * h_r at T_m; the solvers update h_r every step from the current surface temperature), each wall layer
 * (plane L/(k·A), or the shell forms ln(r₂/r₁)/(2πkL) and (1/r₁ − 1/r₂)/(4πk) for cylinders and spheres
 * without a given wall area), and the inner film (Incropera et al., §3.1 and §3.3–3.4). A wrapped
 * cylinder's ends are covered too: each layer is the curved shell in parallel with two flat discs at
 * the layer's mid-radius, and the outside film covers the ends.
 */
export function resistances(product: Product, geometry: Geometry | null, productArea_m2: number, pack: Pack | undefined, tMean_C: number): Resistances {
  const items: Array<Omit<ResistanceItem, "share">> = [];
  let hr = 0;
  let wall: Resistances["wall"] = "none";
  let rWall = 0;
  let rInner = 0;
  let outerArea = productArea_m2;
  const layers: Resistances["layers"] = [];
  if (!pack) {
    if (product.h_W_m2K === undefined) throw new Error("give a pack, or h_W_m2K on the product");
    items.push({ name: "surface film", kind: "outer film", r_K_W: 1 / (product.h_W_m2K * productArea_m2) });
    rWall = items[0]!.r_K_W;
  } else {
    hr = pack.emissivity ? radiationCoefficient(pack.emissivity, tMean_C, tMean_C) : 0;
    const shape = product.shape?.kind;
    const shell = pack.area_m2 === undefined && pack.layers.length > 0 && geometry && (shape === "sphere" || shape === "cylinder");
    if (shell && geometry) {
      const r0 = geometry.conduction.half_m;
      const len = geometry.conduction.extent;
      let r = r0;
      const layerItems: Array<Omit<ResistanceItem, "share">> = [];
      for (const layer of pack.layers) {
        const r2 = r + layer.thickness_m;
        let R: number, vol: number;
        if (shape === "sphere") {
          R = (1 / r - 1 / r2) / (4 * Math.PI * layer.k_W_mK);
          vol = (4 / 3) * Math.PI * (r2 ** 3 - r ** 3);
        } else {
          const ends = 2 * Math.PI * ((r + r2) / 2) ** 2;
          R = 1 / ((2 * Math.PI * layer.k_W_mK * len) / Math.log(r2 / r) + (layer.k_W_mK * ends) / layer.thickness_m);
          vol = Math.PI * (r2 * r2 - r * r) * len + ends * layer.thickness_m;
        }
        layerItems.push({ name: layer.name, kind: "layer", r_K_W: R });
        layers.push({ r_K_W: R, volume_m3: vol });
        r = r2;
      }
      outerArea = shape === "sphere" ? 4 * Math.PI * r * r : 2 * Math.PI * r * len + 2 * Math.PI * r * r;
      items.push({ name: "outside film", kind: "outer film", r_K_W: 1 / ((pack.h_outside_W_m2K + hr) * outerArea) }, ...layerItems);
      wall = shape === "sphere" ? "spherical shell" : "cylindrical shell";
    } else {
      const A = pack.area_m2 ?? productArea_m2;
      outerArea = A;
      items.push({ name: "outside film", kind: "outer film", r_K_W: 1 / ((pack.h_outside_W_m2K + hr) * A) });
      for (const layer of pack.layers) {
        const R = layer.thickness_m / (layer.k_W_mK * A);
        items.push({ name: layer.name, kind: "layer", r_K_W: R });
        layers.push({ r_K_W: R, volume_m3: A * layer.thickness_m });
      }
      wall = pack.layers.length ? "plane" : "none";
    }
    rWall = items.reduce((s, i) => s + i.r_K_W, 0);
    if (pack.h_inside_W_m2K !== undefined) {
      rInner = 1 / (pack.h_inside_W_m2K * productArea_m2);
      items.push({ name: "inside film", kind: "inner film", r_K_W: rInner });
    }
  }
  const total = rWall + rInner;
  return {
    items: items.map((i) => ({ ...i, share: i.r_K_W / total })),
    r_total_K_W: total,
    r_wall_K_W: rWall,
    r_inner_K_W: rInner,
    u_product_W_m2K: 1 / (total * productArea_m2),
    h_radiation_W_m2K: hr,
    wall,
    outer_area_m2: outerArea,
    h_outside_W_m2K: pack ? pack.h_outside_W_m2K : product.h_W_m2K!,
    emissivity: pack?.emissivity ?? 0,
    layers,
  };
}
