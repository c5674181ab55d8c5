import { describe, it } from "vitest";
import { meanKineticTemperature_C } from "@/lib/exposure/mkt";
import { expectClose } from "../helpers/numeric";

// Published formula (USP general chapter on good storage and distribution practices; ICH Q1A):
// T_MKT = (ΔH/R) / −ln(Σ exp(−ΔH/(R·Ti)) / n), ΔH/R = 83.144 kJ/mol / 8.3144 J/(mol·K) = 10,000 K.
describe("meanKineticTemperature_C", () => {
  it("meanKineticTemperature_C of a constant series is that temperature", () => {
    const t = Float64Array.from([0, 3600, 7200]);
    expectClose(meanKineticTemperature_C(t, Float64Array.from([8, 8, 8])), 8, { abs: 1e-9 });
  });

  it("meanKineticTemperature_C of equally spaced readings at 20 and 30 °C matches the formula worked by hand", () => {
    // Worked: 10000 / −ln((e^(−10000/293.15) + e^(−10000/303.15)) / 2) − 273.15 = 26.2598869160 °C
    const t = Float64Array.from([0, 3600, 7200, 10800]);
    expectClose(meanKineticTemperature_C(t, Float64Array.from([20, 30, 20, 30])), 26.259886916, { abs: 1e-8 });
  });

  it("meanKineticTemperature_C weights irregular readings by the time they stand for", () => {
    // Readings at 0, 2, 4, 5, 6, 7 h; each stands for half of each adjoining interval (a full interval
    // at the ends): weights 2, 2, 1.5, 1, 1, 1 h, so 25 °C counts 5.5 h, 40 °C 1 h and 15 °C 2 h.
    const t = Float64Array.from([0, 2, 4, 5, 6, 7].map((h) => h * 3600));
    const v = Float64Array.from([25, 25, 25, 40, 15, 15]);
    const expected =
      10000 / -Math.log((5.5 * Math.exp(-10000 / 298.15) + 1 * Math.exp(-10000 / 313.15) + 2 * Math.exp(-10000 / 288.15)) / 8.5) - 273.15;
    expectClose(meanKineticTemperature_C(t, v), expected, { abs: 1e-9 });
  });
});
