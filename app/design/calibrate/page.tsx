import Link from "next/link";
import { z } from "zod";
import { listTraces } from "@/lib/db/traces";
import { listLatestDefinitions } from "@/lib/db/definitions";
import { runCalibration } from "@/lib/services/calibration";
import { readableDuration } from "@/lib/thermal/screening";
import { TemperatureChart } from "@/app/components/TemperatureChart";
import { SaveEffectivePack } from "./SaveEffectivePack";
import { WriteGate } from "@/app/components/WriteGate";
import { displayZone } from "@/app/displayZone";

export const dynamic = "force-dynamic";

type Q = { trace?: string; product?: string; pack?: string; fitInitial?: string; fitOffset?: string; factor?: string };

/** The mismatch factor as typed: blank means the default of 2; anything else must be a number above 1. */
const factorSchema = z
  .string()
  .trim()
  .transform((s) => (s === "" ? 2 : Number(s)))
  .pipe(z.number({ error: "must be a number greater than 1 (e.g. 2)" }).finite({ message: "must be a number greater than 1 (e.g. 2)" }).gt(1, { message: "must be a number greater than 1 (e.g. 2)" }));

export default async function CalibratePage({ searchParams }: { searchParams: Promise<Q> }) {
  const q = await searchParams;
  const [traces, products, packs] = await Promise.all([listTraces(), listLatestDefinitions("product"), listLatestDefinitions("pack")]);
  const withProbe = traces.filter((t) => t.hasProbe);
  const fitInitial = q.fitInitial === "1", fitOffset = q.fitOffset === "1";
  // A refused value is shown as typed, with its message, and nothing is fitted (never replaced silently).
  const factorParsed = factorSchema.safeParse(q.factor ?? "");
  const factorError = factorParsed.success ? undefined : `Warn when R differs by more than ×: '${q.factor}' ${factorParsed.error.issues[0]!.message}`;
  const out = q.trace && factorParsed.success ? await runCalibration({ traceId: q.trace, productId: q.product || undefined, packId: q.pack || undefined, fitInitial, fitOffset, mismatchFactor: factorParsed.data }) : null;
  const ci = (a: [number, number], f: (x: number) => string) => `${f(a[0])} to ${f(a[1])}`;
  const zone = await displayZone(traces.find((t) => t.id === q.trace)?.importSettings?.timeZone);
  return (
    <>
      <h1>Calibrate from a probe test</h1>
      <section className="card">
        <p className="muted">Fit the lumped time constant to a test shipment that logged both the air and a probe in the product (or a product simulant). Import such a file under <Link href="/traces">Traces</Link> with its product-probe channel.</p>
        <form className="stack" style={{ maxWidth: "none", display: "flex", flexWrap: "wrap", gap: "0.8rem", alignItems: "end" }} aria-label="Calibration">
          <label>Trace with a probe
            <select name="trace" defaultValue={q.trace ?? ""} data-testid="cal-trace">
              <option value="">(choose)</option>
              {withProbe.map((t) => <option key={t.id} value={t.id}>{t.name}</option>)}
            </select>
          </label>
          <label>Product (for R and h)
            <select name="product" defaultValue={q.product ?? ""} data-testid="cal-product">
              <option value="">(none)</option>
              {products.map((p) => <option key={p.id} value={p.id}>{p.name} v{p.version}</option>)}
            </select>
          </label>
          <label>Pack to compare with
            <select name="pack" defaultValue={q.pack ?? ""} data-testid="cal-pack">
              <option value="">(none)</option>
              {packs.map((p) => <option key={p.id} value={p.id}>{p.name} v{p.version}</option>)}
            </select>
          </label>
          <label className="choice"><input type="checkbox" name="fitInitial" value="1" defaultChecked={fitInitial} data-testid="cal-fit-initial" /> fit the initial temperature</label>
          <label className="choice"><input type="checkbox" name="fitOffset" value="1" defaultChecked={fitOffset} data-testid="cal-fit-offset" /> fit a sensor offset</label>
          <label>Warn when R differs by more than ×<input name="factor" size={4} defaultValue={q.factor ?? "2"} aria-invalid={factorError ? true : undefined} data-testid="cal-factor" /></label>
          <button type="submit">Fit</button>
        </form>
        {withProbe.length === 0 && <p className="muted" data-testid="no-probe">No stored trace has a product-probe channel yet.</p>}
      </section>
      {factorError && <p className="form-error" data-testid="cal-error">{factorError}</p>}
      {out && !out.ok && <p className="form-error" data-testid="cal-error">{out.message}</p>}
      {out && out.ok && (
        <>
          <section className="card" data-testid="cal-result">
            <dl className="facts">
              <dt>tau</dt><dd data-testid="cal-tau">{readableDuration(out.result.tau_s)} ({Math.round(out.result.tau_s)} s), 95 % interval {ci(out.result.tau_ci95_s, (x) => `${Math.round(x)} s`)}</dd>
              <dt>Initial temperature</dt><dd>{out.result.initial_C.toFixed(2)} °C{out.result.initial_ci95_C ? ` (95 %: ${ci(out.result.initial_ci95_C, (x) => x.toFixed(2))})` : " (first probe reading)"}</dd>
              {out.result.offset_K !== undefined && <><dt>Sensor offset</dt><dd>{out.result.offset_K.toFixed(3)} K (95 %: {ci(out.result.offset_ci95_K!, (x) => x.toFixed(3))})</dd></>}
              <dt>RMSE</dt><dd>{out.result.rmse_K.toFixed(3)} K over {out.result.samples} probe readings; residual lag-1 correlation {out.result.residual_lag1.toFixed(2)}</dd>
              {out.result.r_total_K_W !== undefined && (
                <>
                  <dt>Effective R_total</dt><dd>{out.result.r_total_K_W.toPrecision(4)} K/W (from the definitions: {out.result.r_total_from_definition_K_W!.toPrecision(4)} K/W)</dd>
                  <dt>Effective h</dt><dd>{out.result.h_eff_W_m2K!.toPrecision(3)} W/m²·K on the product&apos;s surface</dd>
                </>
              )}
            </dl>
            {out.result.warnings.length > 0 && <ul className="warnings" data-testid="cal-warnings">{out.result.warnings.map((w) => <li key={w}>{w}</li>)}</ul>}
          </section>
          <section className="card">
            <TemperatureChart
              title="Air, probe and fitted lumped model"
              height={260}
              zone={zone}
              times_ms={Array.from(out.t_s, (t) => t * 1000)}
              lines={[
                { label: "Air", color: "var(--air)", values: Array.from(out.air_C) },
                { label: "Probe (measured)", color: "#b8860b", values: Array.from(out.probe_C) },
                { label: "Fitted", color: "var(--core)", values: Array.from(out.result.fitted_C), dashed: true },
              ]}
            />
            <TemperatureChart
              title="Residuals: probe minus fit"
              unit="K"
              height={180}
              zone={zone}
              times_ms={Array.from(out.t_s).filter((_, i) => !Number.isNaN(out.probe_C[i]!)).map((t) => t * 1000)}
              lines={[{ label: "Residual", color: "#7a4fa3", values: Array.from(out.result.residuals_K) }]}
              thresholds={[{ label: "0 K", value_C: 0 }]}
            />
          </section>
          {out.product && (
            <section className="card">
              <h2 style={{ marginTop: 0 }}>Keep this result</h2>
              <p className="muted">
                Saves a pack whose single outside coefficient reproduces the fitted R_total for {out.product.name}, with the calibration recorded as its provenance
                {out.pack ? `, as a new version of ${out.pack.name} (version ${out.pack.version} stays as it was)` : ", as a new pack"}.
              </p>
              <WriteGate permission="definition:edit">
                <SaveEffectivePack traceId={q.trace!} productId={out.product.id} packId={out.pack?.id} fitInitial={fitInitial} fitOffset={fitOffset} suggestedName={`Effective pack for ${out.product.name} (calibrated)`} />
              </WriteGate>
            </section>
          )}
        </>
      )}
    </>
  );
}
