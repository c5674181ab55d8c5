import { listTraces } from "@/lib/db/traces";
import { listLatestDefinitions } from "@/lib/db/definitions";
import { ReviewForm } from "./ReviewForm";

export const dynamic = "force-dynamic";

export default async function NewReviewPage({ searchParams }: { searchParams: Promise<{ trace?: string }> }) {
  const { trace } = await searchParams;
  const [traces, products, packs, limits] = await Promise.all([listTraces(), listLatestDefinitions("product"), listLatestDefinitions("pack"), listLatestDefinitions("limits")]);
  return (
    <>
      <h1>New review</h1>
      <section className="card">
        <p className="muted">The model predicts the product&apos;s core, surface and mean temperatures through the trace (lumped capacitance, or 1-D conduction when the Biot number calls for it); the limit set&apos;s rules are then judged on those channels and on the air.</p>
        <ReviewForm
          traces={traces.map((t) => ({ id: t.id, label: `${t.name} (${t.sampleCount} samples)` }))}
          products={products.map((p) => ({ id: p.id, label: `${p.name} v${p.version}` }))}
          packs={packs.map((p) => ({ id: p.id, label: `${p.name} v${p.version}` }))}
          limits={limits.map((l) => ({ id: l.id, label: `${l.name} v${l.version}` }))}
          initialTrace={trace}
        />
      </section>
    </>
  );
}
