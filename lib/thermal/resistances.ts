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
}

/**
 * Series resistances from the air to the product surface: the outer film (convection plus linearised
 * radiation h_r = 4·ε·σ·T_m³), each wall layer (plane L/(k·A), or the shell forms ln(r₂/r₁)/(2πkL) and
 * (1/r₁ − 1/r₂)/(4πk) for cylinders and spheres without a given wall area), and the inner film
 * (Incropera et al., §3.1 and §3.3–3.4). T_m is the temperature the radiation is linearised about.
 */
export function resistances(product: Product, geometry: Geometry | null, productArea_m2: number, pack: Pack | undefined, tMean_C: number): Resistances {
  const tm = tMean_C + 273.15;
  const items: Array<Omit<ResistanceItem, "share">> = [];
  let hr = 0;
  let wall: Resistances["wall"] = "none";
  let rWall = 0;
  let rInner = 0;
  if (!pack) {
    if (product.h_W_m2K === undefined) throw new Error("give a pack, or h_W_m2K on the product");
    items.push({ name: "surface film", kind: "outer film", r_K_W: 1 / (product.h_W_m2K * productArea_m2) });
    rWall = items[0]!.r_K_W;
  } else {
    hr = pack.emissivity ? 4 * pack.emissivity * STEFAN_BOLTZMANN * tm ** 3 : 0;
    const shape = product.shape?.kind;
    const shell = pack.area_m2 === undefined && pack.layers.length > 0 && geometry && (shape === "sphere" || shape === "cylinder");
    if (shell && geometry) {
      const r0 = geometry.conduction.half_m;
      const len = geometry.conduction.extent;
      let r = r0;
      const layerItems: Array<Omit<ResistanceItem, "share">> = [];
      for (const layer of pack.layers) {
        const r2 = r + layer.thickness_m;
        const R = shape === "sphere" ? (1 / r - 1 / r2) / (4 * Math.PI * layer.k_W_mK) : Math.log(r2 / r) / (2 * Math.PI * layer.k_W_mK * len);
        layerItems.push({ name: layer.name, kind: "layer", r_K_W: R });
        r = r2;
      }
      const outerArea = shape === "sphere" ? 4 * Math.PI * r * r : 2 * Math.PI * r * len;
      items.push({ name: "outside film", kind: "outer film", r_K_W: 1 / ((pack.h_outside_W_m2K + hr) * outerArea) }, ...layerItems);
      wall = shape === "sphere" ? "spherical shell" : "cylindrical shell";
    } else {
      const A = pack.area_m2 ?? productArea_m2;
      items.push({ name: "outside film", kind: "outer film", r_K_W: 1 / ((pack.h_outside_W_m2K + hr) * A) });
      for (const layer of pack.layers) items.push({ name: layer.name, kind: "layer", r_K_W: layer.thickness_m / (layer.k_W_mK * A) });
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
  };
}
