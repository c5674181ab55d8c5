/**
 * Names of the demo's design inputs: scripts/generate-demo.ts writes them into public/demo, and the size
 * page looks them up to offer the demo study ready-made (without reading files at request time).
 */
export const DEMO_DESIGN_NAMES = {
  product: "Ready meal tray 450 g (shaped)",
  pack: "EPS tote, 25 mm, with one gel pack (share per tray)",
  limits: "Harrowgate tote design (core rules of the example plan)",
} as const;
