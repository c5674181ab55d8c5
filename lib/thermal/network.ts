import type { Pack } from "./definitions";
import type { ResolvedProduct } from "./resolve";
import type { Resistances } from "./resistances";
import { volumeWithin } from "./geometry";
import { coolantEnthalpy, coolantStartEnthalpy } from "./coolant";
import type { ChainNetwork } from "./solvers/chain";
import type { ConductionGeometry } from "./geometry";
import type { EnthalpyCurve } from "./properties/enthalpyCurve";

export interface BuiltNetwork {
  net: ChainNetwork;
  /** index of the coolant/inner-air node, or −1 */
  coolantNode: number;
  /** index of the outermost product node; product nodes run to the end (the centre) */
  firstProductNode: number;
  /** radius (or distance from the mid-plane) of each product node, m; empty for lumped */
  radii: Float64Array;
  /** resistance from the outer product node to the surface (half a shell), K/W, and the surface to its neighbour outside */
  rHalfOuter_K_W: number;
  rOutside_K_W: number;
  initial_C: Float64Array;
  /** initial enthalpy of every node, J (the coolant node's may lie inside its melting plateau) */
  initialE_J: Float64Array;
  shells: number;
}

/** Conduction resistance between radii r1 < r2 (K/W): plane, cylindrical or spherical shell. */
export function shellResistance(g: ConductionGeometry, r1: number, r2: number, k: number): number {
  if (g.kind === "slab") return (r2 - r1) / (k * 2 * g.extent); // two faces in parallel
  if (g.kind === "cylinder") return Math.log(r2 / r1) / (2 * Math.PI * k * g.extent);
  return (1 / r1 - 1 / r2) / (4 * Math.PI * k);
}

/**
 * Builds the chain: [coolant + inner air] → product node(s). Coolant packs carry no film of their own
 * in the definition, so they are taken to be at the inner-air temperature: one node that holds their
 * enthalpy. Without coolant, the inner air holds no heat and the whole pack is one series resistance.
 * The product is one node (lumped) or `shells` finite-volume shells of equal thickness (conduction),
 * node 0 at the surface side.
 */
export function buildNetwork(p: ResolvedProduct, pack: Pack | undefined, r: Resistances, model: "lumped" | "conduction", shells: number): BuiltNetwork {
  const coolants = pack?.coolants.filter((c) => c.mass_kg > 0) ?? [];
  const hasCoolant = coolants.length > 0;
  const masses: number[] = [];
  const curves: EnthalpyCurve[] = [];
  const init: number[] = [];
  let coolantE = Number.NaN;
  const g: number[] = [];
  if (hasCoolant) {
    masses.push(1);
    const curve = coolantEnthalpy(coolants);
    curves.push(curve);
    // The node starts with the sum of each coolant's own enthalpy (not at the mass-weighted temperature,
    // which loses the latent heat of a warm pack beside a frozen one).
    coolantE = coolantStartEnthalpy(coolants, curve);
    init.push(curve.tAt(coolantE));
  }
  const mat = p.material;
  let radii = new Float64Array(0);
  let rHalf = 0;
  let update: ChainNetwork["updateConductances"];
  const outside = hasCoolant ? r.r_inner_K_W : r.r_total_K_W;

  if (model === "lumped") {
    masses.push(p.mass_kg);
    curves.push(mat.enthalpy);
    init.push(p.product.initial_C);
    if (hasCoolant) g.push(1 / r.r_inner_K_W);
  } else {
    const geo = p.geometry!.conduction;
    const R = geo.half_m;
    const dr = R / shells;
    const totalV = volumeWithin(geo, R);
    radii = new Float64Array(shells);
    // node 0 = outermost shell
    for (let j = 0; j < shells; j++) {
      const outer = R - j * dr;
      const inner = outer - dr;
      radii[j] = outer - dr / 2;
      masses.push((p.mass_kg * (volumeWithin(geo, outer) - volumeWithin(geo, Math.max(inner, 0)))) / totalV);
      curves.push(mat.enthalpy);
      init.push(p.product.initial_C);
    }
    const k0 = p.k_W_mK!;
    rHalf = shellResistance(geo, radii[0]!, R, k0);
    const productStart = hasCoolant ? 1 : 0;
    // Conductances: [coolant→shell0] then shell j → shell j+1, each from node radius to node radius.
    const fill = (T: Float64Array, out: Float64Array) => {
      let idx = 0;
      const kOuter = mat.linear ? k0 : mat.conductivity(T[productStart]!);
      const rh = shellResistance(geo, radii[0]!, R, kOuter);
      if (hasCoolant) out[idx++] = 1 / (r.r_inner_K_W + rh);
      for (let j = 0; j < shells - 1; j++) {
        const k = mat.linear ? k0 : mat.conductivity((T[productStart + j]! + T[productStart + j + 1]!) / 2);
        out[idx++] = 1 / shellResistance(geo, radii[j + 1]!, radii[j]!, k);
      }
      return rh;
    };
    const gArr = new Float64Array((hasCoolant ? 1 : 0) + shells - 1);
    const T0 = Float64Array.from(init);
    fill(T0, gArr);
    g.push(...gArr);
    if (!mat.linear) {
      update = (T, out) => {
        const rh = fill(T, out);
        if (!hasCoolant) net.gAmbient = 1 / (r.r_total_K_W + rh);
      };
    }
  }
  const gAmbient = hasCoolant ? 1 / r.r_wall_K_W : 1 / (r.r_total_K_W + rHalf);
  const net: ChainNetwork = {
    mass: Float64Array.from(masses),
    curves,
    gAmbient,
    g: Float64Array.from(g),
    updateConductances: update,
    linear: mat.linear && !hasCoolant,
  };
  return {
    net,
    coolantNode: hasCoolant ? 0 : -1,
    firstProductNode: hasCoolant ? 1 : 0,
    radii,
    rHalfOuter_K_W: rHalf,
    rOutside_K_W: outside,
    initial_C: Float64Array.from(init),
    initialE_J: Float64Array.from(init, (t, i) => (i === 0 && hasCoolant ? coolantE : masses[i]! * curves[i]!.hAt(t))),
    shells: model === "lumped" ? 1 : shells,
  };
}
