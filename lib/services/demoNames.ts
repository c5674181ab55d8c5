/**
 * Names of the demo's design inputs: scripts/generate-demo.ts writes them into public/demo, and the size
 * page looks them up to offer the demo study ready-made (without reading files at request time).
 */
export const DEMO_DESIGN_NAMES = {
  product: "Ready meal tray 450 g (shaped)",
  pack: "EPS tote, 25 mm, with one gel pack (share per tray)",
  limits: "Harrowgate tote design (core rules of the example plan)",
} as const;

/**
 * The demo's live monitor and its device token. The token is printed in the README so that anyone can feed
 * the demo monitor with the simulator: it is public, so the demo database must never watch a real shipment.
 */
export const DEMO_MONITOR = { name: "Route 7 north, tote 3, live (demo)", token: "cmd_demo-route7-tote3-public-token" } as const;

/**
 * The demo's shipment: the 16 June load of Route 7 north, with tote 3's logger (from the register) and the
 * 16 June trace, reviewed as a shipment and awaiting sign-off. The reference is the one the demo monitor names.
 */
export const DEMO_SHIPMENT = { reference: "R7-0616 (invented)", lane: "Route 7 north (demo)", serial: "HX-20417", position: "tote 3 of 8" } as const;
