import Link from "next/link";
import { listTraces, getTrace } from "@/lib/db/traces";
import { getDefinition, listLatestDefinitions } from "@/lib/db/definitions";
import { profileSchema, profileSeries, type Profile } from "@/lib/design/profile";
import { packSchema, productSchema } from "@/lib/thermal/definitions";
import { unmatchedConsequenceRule } from "@/lib/exposure/consequenceRules";
import { isConsequenceRule, limitSetSchema } from "@/lib/exposure/limits";
import { CONSEQUENCE_CAUTIONS } from "@/lib/consequence/cautions";
import { bridgeGaps } from "@/lib/trace/series";
import { demoSizingQuery } from "@/lib/services/demo";
import { DesignRunner } from "./DesignRunner";

export const dynamic = "force-dynamic";

type Q = { source?: string; product?: string; pack?: string; limits?: string };

export default async function SizePage({ searchParams }: { searchParams: Promise<Q> }) {
  const q = await searchParams;
  const [traces, profiles, products, packs, limits] = await Promise.all([listTraces(), listLatestDefinitions<Profile>("profile"), listLatestDefinitions("product"), listLatestDefinitions("pack"), listLatestDefinitions("limits")]);
  let setup: { t_s: number[]; air_C: number[]; product: ReturnType<typeof productSchema.parse>; pack?: ReturnType<typeof packSchema.parse>; limits: ReturnType<typeof limitSetSchema.parse> } | null = null;
  let problem: string | null = null;
  if (q.source && q.product && q.limits) {
    const [kind, id] = q.source.split(":");
    let series = null;
    if (kind === "profile") {
      const d = await getDefinition<Profile>(id ?? "");
      const p = d ? profileSchema.safeParse(d.body) : null;
      series = p?.success ? profileSeries(p.data) : null;
    } else {
      const tr = await getTrace(id ?? "");
      series = tr ? { t_s: tr.series.t_s, air_C: bridgeGaps(tr.series) } : null;
    }
    const product = await getDefinition(q.product);
    const pack = q.pack ? await getDefinition(q.pack) : null;
    const lim = await getDefinition(q.limits);
    const p = product ? productSchema.safeParse(product.body) : null;
    const k = pack ? packSchema.safeParse(pack.body) : null;
    const l = lim ? limitSetSchema.safeParse(lim.body) : null;
    if (!series) problem = "that profile or trace does not exist";
    else if (!p?.success) problem = "that product does not exist";
    else if (!l?.success) problem = "that limit set does not exist";
    else if (l.data.rules.some((r) => r.channel === "probe")) problem = "design studies have no measured probe: choose a limit set without probe rules";
    else if (unmatchedConsequenceRule(l.data, p.data.consequences ?? [])) problem = `${unmatchedConsequenceRule(l.data, p.data.consequences ?? [])!.message}: choose a product that has it, or a limit set without that rule`;
    else if (!k?.success && p.data.h_W_m2K === undefined) problem = "this product needs a pack (it has no surface coefficient of its own)";
    else setup = { t_s: Array.from(series.t_s), air_C: Array.from(series.air_C), product: p.data, pack: k?.success ? k.data : undefined, limits: l.data };
  }
  const demo = q.source ? null : await demoSizingQuery();
  return (
    <>
      <h1>Size a pack for a route</h1>
      {demo && (
        <p data-testid="size-demo-link">
          New here? <Link href={`/design/size?${new URLSearchParams(demo).toString()}`}>Size the demo tote&apos;s EPS wall for the summer route</Link>, against the core rules of the example plan.
        </p>
      )}
      <section className="card">
        <p className="muted">Choose the ambient (a stored <Link href="/design/profiles">profile</Link> or trace), the product, its pack and the limits it must meet.</p>
        {/* keyed by the query: after a client-side navigation (the demo link) the selects show the new choice, not the old DOM state */}
        <form key={`${q.source}|${q.product}|${q.pack}|${q.limits}`} style={{ display: "flex", flexWrap: "wrap", gap: "0.8rem", alignItems: "end" }} aria-label="Design inputs">
          <label>Ambient
            <select name="source" defaultValue={q.source ?? ""} data-testid="size-source">
              <option value="">(choose)</option>
              {profiles.map((p) => <option key={p.id} value={`profile:${p.id}`}>profile: {p.name} v{p.version}</option>)}
              {traces.map((t) => <option key={t.id} value={`trace:${t.id}`}>trace: {t.name}</option>)}
            </select>
          </label>
          <label>Product<select name="product" defaultValue={q.product ?? ""} data-testid="size-product"><option value="">(choose)</option>{products.map((p) => <option key={p.id} value={p.id}>{p.name} v{p.version}</option>)}</select></label>
          <label>Pack<select name="pack" defaultValue={q.pack ?? ""} data-testid="size-pack"><option value="">(none)</option>{packs.map((p) => <option key={p.id} value={p.id}>{p.name} v{p.version}</option>)}</select></label>
          <label>Limit set<select name="limits" defaultValue={q.limits ?? ""} data-testid="size-limits"><option value="">(choose)</option>{limits.map((l) => <option key={l.id} value={l.id}>{l.name} v{l.version}</option>)}</select></label>
          <button type="submit">Use these</button>
        </form>
      </section>
      {problem && <p className="form-error" data-testid="size-problem">{problem}</p>}
      {setup && setup.limits.rules.some(isConsequenceRule) && (
        <p className="caution" data-testid="consequence-caution">Growth and shelf-life rules: {CONSEQUENCE_CAUTIONS.join(" ")}</p>
      )}
      {setup && <DesignRunner key={`${q.source}|${q.product}|${q.pack}|${q.limits}`} {...setup} />}
    </>
  );
}
