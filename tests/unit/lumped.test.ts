import { describe, it, expect } from "vitest";
import { lumpedResponse } from "@/lib/thermal/lumped";
import { expectClose, irregularTimes, seeded } from "../helpers/numeric";

// Analytical solutions of the lumped energy balance C·dT/dt = (T_air − T)/R, tau = R·C
// (Incropera, DeWitt, Bergman, Lavine, Fundamentals of Heat and Mass Transfer, 6th ed., §5.2, eq. 5.6
// for the step; the ramp is the same first-order linear ODE with T_air = a0 + s·t, solved by an
// integrating factor: T(t) = a0 + s·(t − tau) + (T0 − a0 + s·tau)·exp(−t/tau)).
const tau = 3600;

describe("lumpedResponse", () => {
  it("lumpedResponse matches the analytical step response at irregular sample times", () => {
    const t = irregularTimes(seeded(1), 6 * tau, 1, 900);
    const air = new Float64Array(t.length).fill(20);
    const T = lumpedResponse(t, air, 4, tau);
    for (let i = 0; i < t.length; i++) {
      expectClose(T[i]!, 20 + (4 - 20) * Math.exp(-t[i]! / tau), { abs: 1e-11 });
    }
  });

  it("lumpedResponse matches the analytical ramp response at irregular sample times", () => {
    const t = irregularTimes(seeded(2), 8 * tau, 5, 2400);
    const a0 = 2, s = 8 / 3600; // 8 K per hour
    const air = Float64Array.from(t, (ti) => a0 + s * ti);
    const T0 = 5;
    const T = lumpedResponse(t, air, T0, tau);
    for (let i = 0; i < t.length; i++) {
      const exact = a0 + s * (t[i]! - tau) + (T0 - a0 + s * tau) * Math.exp(-t[i]! / tau);
      expectClose(T[i]!, exact, { abs: 1e-10 });
    }
  });

  it("lumpedResponse carries no step-size error: one long interval equals many short ones", () => {
    const air = (ti: number) => 3 + (ti / 7200) * 10;
    const coarse = Float64Array.from([0, 7200]);
    const fine = Float64Array.from({ length: 7201 }, (_, i) => i);
    const Tc = lumpedResponse(coarse, Float64Array.from(coarse, air), 3, tau);
    const Tf = lumpedResponse(fine, Float64Array.from(fine, air), 3, tau);
    expectClose(Tc[1]!, Tf[7200]!, { abs: 1e-10 });
  });

  it("lumpedResponse loses no digits on intervals far shorter or longer than tau", () => {
    const t = Float64Array.from([0, 1e-6, 2e-6, 1e6]);
    const air = Float64Array.from([10, 10, 10, 10]);
    const T = lumpedResponse(t, air, 0, tau);
    expectClose(T[1]!, 10 * -Math.expm1(-1e-6 / tau), { rel: 1e-12 });
    expect(T[3]).toBe(10);
  });

  it("lumpedResponse refuses a non-positive time constant", () => {
    expect(() => lumpedResponse(Float64Array.from([0, 1]), Float64Array.from([0, 1]), 0, 0)).toThrow(/tau_s/);
  });
});
