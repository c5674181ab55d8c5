import type { Coolant, Pack } from "./definitions";
import type { ResolvedProduct } from "./resolve";
import { radiationCoefficient, type Resistances } from "./resistances";
import type { ProductGrid } from "./grids";
import type { GraphNetwork } from "./solvers/graph";
import { coolantEnthalpy, coolantStartEnthalpy } from "./coolant";
import { EnthalpyCurve } from "./properties/enthalpyCurve";
import { respirationHeat_W_kg } from "./respiration";

/** Sub-nodes per wall layer that stores heat (second order in the wall; 4 keeps its lag within a few % for thin walls). */
export const WALL_NODES_PER_LAYER = 4;
/** Fixed-point passes for the outer surface temperature that radiation depends on (converges fast: h_r changes slowly with T). */
const RADIATION_PASSES = 3;

type Slot = { kind: "ambient"; node: number } | { kind: "edge"; index: number } | { kind: "junction"; index: number } | { kind: "junctionAmbient" };

/** A conductance that the solver updates: 1/(base + rfScale·R_film + halfR/k(T_node)). */
interface Link {
  slot: Slot;
  node: number;
  base: number;
  rfScale: number;
  halfR: number;
}

export interface BuiltGraph {
  net: GraphNetwork;
  initialE: Float64Array;
  grid: ProductGrid;
  /** index of the first product node; product nodes follow the grid's order */
  productStart: number;
  coolantNodes: number[];
  coolantMass_kg: number[];
  /** notes for the review (coolant treatment, wall storage) */
  notes: string[];
  /** core, surface, mean and coolant temperatures from one sample's node temperatures */
  read(T: Float64Array, air_C: number): { core: number; surface: number; mean: number; coolant: number | null };
}

function constantCurve(cp: number): EnthalpyCurve {
  return new EnthalpyCurve(Float64Array.of(-80, 120), Float64Array.of(0, 200 * cp));
}

/**
 * Assembles product grid and pack into one network, from the ambient inwards: the outside film
 * (convection plus radiation, updated every step), the wall layers (resistances; layers with density
 * and specific heat become WALL_NODES_PER_LAYER nodes each), the inner air, coolants and the product.
 *   - Coolants without `area_m2` share one node that is the inner air (the first release's assumption);
 *     its starting enthalpy is the sum of each coolant's own.
 *   - Coolants with `area_m2` are nodes of their own, joined to the inner air through their film
 *     (h_W_m2K, default the pack's inside film) and optionally to the product surface by contact.
 *   - Without coolant the inner air holds no heat: a junction eliminated exactly in the solver.
 *   - Without an inside film the product surface meets the wall directly; the outside resistance is
 *     shared among the faces in proportion to their area.
 */
export function buildGraph(p: ResolvedProduct, pack: Pack | undefined, r: Resistances, grid: ProductGrid, air0_C: number): BuiltGraph {
  const mass: number[] = [], curves: EnthalpyCurve[] = [], E0: number[] = [], temp0: number[] = [];
  const ea: number[] = [], eb: number[] = [], eg: number[] = [];
  const gAmb: number[] = [];
  const links: Link[] = [];
  const notes: string[] = [];
  const addNode = (m: number, c: EnthalpyCurve, e: number, t: number) => {
    mass.push(m); curves.push(c); E0.push(e); gAmb.push(0); temp0.push(t);
    return mass.length - 1;
  };
  const addEdge = (i: number, j: number, g: number) => {
    ea.push(i); eb.push(j); eg.push(g);
    return eg.length - 1;
  };
  const mat = p.material;
  const t0 = p.product.initial_C;
  const productArea = grid.faceArea.reduce((s, a) => s + a, 0);

  // Coolants first (their initial temperatures set the wall's starting profile).
  const active = (pack?.coolants ?? []).filter((c) => c.mass_kg > 0);
  const lump = active.filter((c) => c.area_m2 === undefined);
  const own = active.filter((c) => c.area_m2 !== undefined);
  const coolantNodes: number[] = [], coolantMass: number[] = [];
  let lumpNode = -1;
  if (lump.length) {
    const curve = coolantEnthalpy(lump);
    const e = coolantStartEnthalpy(lump, curve);
    lumpNode = addNode(1, curve, e, curve.tAt(e));
    coolantNodes.push(lumpNode);
    coolantMass.push(lump.reduce((s, c) => s + c.mass_kg, 0));
    notes.push(`${lump.map((c) => c.name).join(", ")}: no area_m2, so taken to be at the inner-air temperature (one node)`);
  }
  const ownNodes = own.map((c: Coolant) => {
    const curve = coolantEnthalpy([c]);
    const i = addNode(1, curve, coolantStartEnthalpy([c], curve), c.initial_C);
    coolantNodes.push(i);
    coolantMass.push(c.mass_kg);
    return i;
  });
  if (own.length) notes.push(`${own.map((c) => c.name).join(", ")}: own node${own.length > 1 ? "s" : ""} with own film to the inner air`);

  // Product nodes.
  const productStart = mass.length;
  for (let i = 0; i < grid.share.length; i++) {
    const m = p.mass_kg * grid.share[i]!;
    addNode(m, mat.enthalpy, m * mat.enthalpy.hAt(t0), t0);
  }
  const k0 = p.k_W_mK ?? Number.NaN;
  const productEdges: number[] = [];
  for (let e = 0; e < grid.edgeShape.length; e++) productEdges.push(addEdge(productStart + grid.edgeA[e]!, productStart + grid.edgeB[e]!, k0 * grid.edgeShape[e]!));

  // Wall, outside in.
  const hasPack = pack !== undefined;
  const rFilm0 = r.items.find((i) => i.kind === "outer film")!.r_K_W;
  const insideT0 = lumpNode >= 0 ? temp0[lumpNode]! : t0;
  const rWallLayers = r.layers.reduce((s, l) => s + l.r_K_W, 0);
  let attach = -1; // −1: the ambient
  let pending = 0;
  let rAlong = rFilm0;
  const wallProfile = (rPos: number) => air0_C + ((insideT0 - air0_C) * rPos) / (rFilm0 + rWallLayers);
  (pack?.layers ?? []).forEach((layer, li) => {
    const R = r.layers[li]!.r_K_W;
    if (layer.density_kg_m3 === undefined || layer.cp_J_kgK === undefined) {
      pending += R;
      rAlong += R;
      return;
    }
    const n = WALL_NODES_PER_LAYER;
    const mSub = (layer.density_kg_m3 * r.layers[li]!.volume_m3) / n;
    const curve = constantCurve(layer.cp_J_kgK);
    for (let s = 0; s < n; s++) {
      const tStart = wallProfile(rAlong + (R / n) * (s + 0.5));
      const w = addNode(mSub, curve, mSub * curve.hAt(tStart), tStart);
      const rr = pending + R / n / 2;
      if (attach < 0) links.push({ slot: { kind: "ambient", node: w }, node: w, base: rr, rfScale: 1, halfR: 0 });
      else addEdge(attach, w, 1 / rr);
      attach = w;
      pending = R / n / 2;
    }
    rAlong += R;
  });
  if (pack?.layers.some((l) => l.density_kg_m3 !== undefined)) notes.push("wall layers with density and specific heat store heat (nodes)");

  // Inside: the coolant node, a massless junction, or the product faces directly.
  const hIn = pack?.h_inside_W_m2K;
  let junction: GraphNetwork["junction"] = null;
  const jNode: number[] = [], jG: number[] = [];
  let junctionAmbient = 0;
  type Inside = { kind: "node"; node: number } | { kind: "junction" } | { kind: "direct" };
  let inside: Inside;
  if (lumpNode >= 0) inside = { kind: "node", node: lumpNode };
  else if (hIn !== undefined) inside = { kind: "junction" };
  else inside = { kind: "direct" };
  // wall → inside
  if (inside.kind === "node") {
    if (attach < 0) links.push({ slot: { kind: "ambient", node: inside.node }, node: inside.node, base: pending, rfScale: 1, halfR: 0 });
    else addEdge(attach, inside.node, 1 / pending);
  } else if (inside.kind === "junction") {
    if (attach < 0) links.push({ slot: { kind: "junctionAmbient" }, node: -1, base: pending, rfScale: 1, halfR: 0 });
    else {
      jNode.push(attach);
      jG.push(1 / pending);
    }
  }
  // inside → product faces
  const faceLink: Link[] = [];
  for (let f = 0; f < grid.faceNode.length; f++) {
    const node = productStart + grid.faceNode[f]!;
    const share = productArea / grid.faceArea[f]!;
    const halfR = grid.faceHalfR[f]!;
    if (inside.kind === "node") {
      links.push({ slot: { kind: "edge", index: addEdge(inside.node, node, 0) }, node, base: 1 / (hIn! * grid.faceArea[f]!), rfScale: 0, halfR });
    } else if (inside.kind === "junction") {
      jNode.push(node);
      jG.push(0);
      links.push({ slot: { kind: "junction", index: jG.length - 1 }, node, base: 1 / (hIn! * grid.faceArea[f]!), rfScale: 0, halfR });
    } else if (attach < 0) {
      links.push({ slot: { kind: "ambient", node }, node, base: pending * share, rfScale: share, halfR });
    } else {
      links.push({ slot: { kind: "edge", index: addEdge(attach, node, 0) }, node, base: pending * share, rfScale: 0, halfR });
    }
    faceLink.push(links[links.length - 1]!);
  }
  // coolants with their own film, and contact with the product
  own.forEach((c, ci) => {
    const node = ownNodes[ci]!;
    const g = (c.h_W_m2K ?? hIn!) * c.area_m2!;
    if (inside.kind === "node") addEdge(inside.node, node, g);
    else {
      jNode.push(node);
      jG.push(g);
    }
    if (c.contact_area_m2 !== undefined) {
      for (let f = 0; f < grid.faceNode.length; f++) {
        const pn = productStart + grid.faceNode[f]!;
        const gc = c.h_contact_W_m2K! * c.contact_area_m2 * (grid.faceArea[f]! / productArea);
        links.push({ slot: { kind: "edge", index: addEdge(node, pn, 0) }, node: pn, base: 1 / gc, rfScale: 0, halfR: grid.faceHalfR[f]! });
      }
    }
  });
  if (own.some((c) => c.contact_area_m2 !== undefined)) notes.push("coolant contact with the product is spread over the product's surface in proportion to area");
  if (inside.kind === "junction") junction = { gAmbient: junctionAmbient, node: Int32Array.from(jNode), g: Float64Array.from(jG) };

  const net: GraphNetwork = {
    mass: Float64Array.from(mass),
    curves,
    edgeA: Int32Array.from(ea),
    edgeB: Int32Array.from(eb),
    edgeG: Float64Array.from(eg),
    gAmbient: Float64Array.from(gAmb),
    junction,
  };

  const setSlot = (s: Slot, g: number) => {
    if (s.kind === "ambient") net.gAmbient[s.node] = g;
    else if (s.kind === "edge") net.edgeG[s.index] = g;
    else if (s.kind === "junction") net.junction!.g[s.index] = g;
    else net.junction!.gAmbient = g;
  };
  const getSlot = (s: Slot): number =>
    s.kind === "ambient" ? net.gAmbient[s.node]! : s.kind === "edge" ? net.edgeG[s.index]! : s.kind === "junction" ? net.junction!.g[s.index]! : net.junction!.gAmbient;
  const kAt = (t: number) => (mat.linear ? k0 : mat.conductivity(t));
  let rFilm = rFilm0;
  const applyLinks = (T: Float64Array | null) => {
    for (const l of links) {
      const rh = l.halfR > 0 ? l.halfR / kAt(T ? T[l.node]! : t0) : 0;
      setSlot(l.slot, 1 / (l.base + l.rfScale * rFilm + rh));
    }
  };
  applyLinks(null);

  const junctionTemp = (T: Float64Array, air: number) => {
    const J = net.junction!;
    let num = J.gAmbient * air, den = J.gAmbient;
    for (let k = 0; k < J.node.length; k++) {
      num += J.g[k]! * T[J.node[k]!]!;
      den += J.g[k]!;
    }
    return num / den;
  };

  const outer = links.filter((l) => l.rfScale > 0);
  const radiates = hasPack && r.emissivity > 0;
  const conductivityVaries = !mat.linear && (productEdges.length > 0 || links.some((l) => l.halfR > 0));
  if (radiates || conductivityVaries) {
    net.update = (T, air) => {
      if (conductivityVaries) {
        for (let e = 0; e < productEdges.length; e++) {
          const idx = productEdges[e]!;
          net.edgeG[idx] = mat.conductivity((T[ea[idx]!]! + T[eb[idx]!]!) / 2) * grid.edgeShape[e]!;
        }
      }
      if (radiates) {
        // temperature just inside the outside film: the first node or junction behind it, or the faces' mean
        let tRef: number, rest: number;
        const first = outer[0]!;
        if (first.slot.kind === "junctionAmbient") {
          tRef = junctionTemp(T, air);
          rest = first.base;
        } else if (outer.length === 1) {
          tRef = T[first.node]!;
          rest = first.base;
        } else {
          let s = 0, a = 0;
          for (let f = 0; f < grid.faceNode.length; f++) {
            s += grid.faceArea[f]! * T[productStart + grid.faceNode[f]!]!;
            a += grid.faceArea[f]!;
          }
          tRef = s / a;
          rest = pending;
        }
        for (let i = 0; i < RADIATION_PASSES; i++) {
          const ts = air + ((tRef - air) * rFilm) / (rFilm + rest);
          rFilm = 1 / ((r.h_outside_W_m2K + radiationCoefficient(r.emissivity, ts, air)) * r.outer_area_m2);
        }
      }
      applyLinks(T);
    };
  }

  if (p.product.respiration) {
    const resp = p.product.respiration;
    const pm = net.mass;
    const end = productStart + grid.share.length;
    net.source = (T, out) => {
      let total = 0;
      for (let i = productStart; i < end; i++) {
        const q = pm[i]! * respirationHeat_W_kg(resp, T[i]!);
        out[i] = out[i]! + q;
        total += q;
      }
      return total;
    };
  }

  const read = (T: Float64Array, air: number) => {
    let core: number;
    if (grid.cellCentredShells && grid.share.length > 1) {
      const c = productStart + grid.core;
      core = T[c]! - (T[c - 1]! - T[c]!) / 8;
    } else core = T[productStart + grid.core]!;
    let mean = 0;
    for (let i = 0; i < grid.share.length; i++) mean += grid.share[i]! * T[productStart + i]!;
    let sA = 0, sT = 0;
    for (let f = 0; f < grid.faceNode.length; f++) {
      const node = productStart + grid.faceNode[f]!;
      let ts = T[node]!;
      const halfR = grid.faceHalfR[f]!;
      if (halfR > 0) {
        const link = faceLink[f]!;
        {
          const rh = halfR / kAt(ts);
          const rExt = 1 / getSlot(link.slot) - rh;
          const s = link.slot;
          const tExt = s.kind === "ambient" ? air : s.kind === "junction" ? junctionTemp(T, air) : s.kind === "edge" ? T[net.edgeA[s.index]! === node ? net.edgeB[s.index]! : net.edgeA[s.index]!]! : air;
          ts = ts + ((tExt - ts) * rh) / (rh + rExt);
        }
      }
      sA += grid.faceArea[f]!;
      sT += grid.faceArea[f]! * ts;
    }
    let coolant: number | null = null;
    if (coolantNodes.length) {
      let m = 0, s = 0;
      coolantNodes.forEach((i, j) => {
        m += coolantMass[j]!;
        s += coolantMass[j]! * T[i]!;
      });
      coolant = s / m;
    }
    return { core, surface: sT / sA, mean, coolant };
  };

  return { net, initialE: Float64Array.from(E0), grid, productStart, coolantNodes, coolantMass_kg: coolantMass, notes, read };
}
