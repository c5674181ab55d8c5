import type { Composition } from "../definitions";

// Initial freezing point from the water content: Chang, H.D. and Tao, L.C. (1981), "Correlations of
// enthalpies of food systems", Journal of Food Science 46:1493–1497, as reproduced in ASHRAE
// Handbook—Refrigeration, "Thermal Properties of Foods" (T_f in kelvin, x_wo the water mass fraction;
// coefficients recalled from memory of that chapter):
//   meats:                 T_f = 271.18 + 1.47·x_wo
//   fruits and vegetables: T_f = 287.56 − 49.19·x_wo + 37.07·x_wo²
// Which one applies is judged from the composition (protein-rich: meat; carbohydrate-rich and lean:
// fruit or vegetable); the water ranges are those of the foods the correlations were fitted to, as
// best recalled. Elsewhere no estimate is offered.

export interface FreezingEstimate {
  freezing_point_C: number;
  correlation: "meat" | "fruit and vegetable";
  source: string;
}

const SOURCE = "Chang and Tao (1981), as in ASHRAE Handbook—Refrigeration";

/** An estimated initial freezing point, or null with the reason none applies. */
export function estimateFreezingPoint(c: Composition): FreezingEstimate | { reason: string } {
  const x = c.water;
  const carbs = c.carbohydrate + c.fiber;
  if (c.protein >= carbs && c.protein >= 0.05) {
    if (x < 0.45 || x > 0.85) return { reason: `water ${x} is outside 0.45–0.85, where the meat correlation of ${SOURCE} was fitted` };
    return { freezing_point_C: 271.18 + 1.47 * x - 273.15, correlation: "meat", source: SOURCE };
  }
  if (carbs > c.protein && c.fat <= 0.05) {
    if (x < 0.7 || x > 0.95) return { reason: `water ${x} is outside 0.70–0.95, where the fruit and vegetable correlation of ${SOURCE} was fitted` };
    return { freezing_point_C: 287.56 - 49.19 * x + 37.07 * x * x - 273.15, correlation: "fruit and vegetable", source: SOURCE };
  }
  return { reason: `the composition is neither meat-like (protein-rich) nor a lean fruit or vegetable, for which ${SOURCE} gives correlations` };
}
