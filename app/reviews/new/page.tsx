import { listTraces } from "@/lib/db/traces";
import { WriteGate } from "@/app/components/WriteGate";
import { listLatestDefinitions, getDefinition } from "@/lib/db/definitions";
import { getReview } from "@/lib/db/reviews";
import { ReviewForm } from "./ReviewForm";

export const dynamic = "force-dynamic";

type Query = { trace?: string; product?: string; pack?: string; limits?: string; model?: string; corrects?: string };

export default async function NewReviewPage({ searchParams }: { searchParams: Promise<Query> }) {
  const q = await searchParams;
  const [traces, products, packs, limits] = await Promise.all([listTraces(), listLatestDefinitions("product"), listLatestDefinitions("pack"), listLatestDefinitions("limits")]);
  const corrects = q.corrects ? await getReview(q.corrects) : null;
  // A correction may use the exact older versions the original used: offer them beside the latest ones.
  const withVersion = async (list: Array<{ id: string; name: string; version: number }>, id?: string) => {
    if (!id || list.some((d) => d.id === id)) return list;
    const d = await getDefinition(id);
    return d ? [...list, d] : list;
  };
  const opt = (d: { id: string; name: string; version: number }) => ({ id: d.id, label: `${d.name} v${d.version}` });
  return (
    <>
      <h1>{corrects ? "Correct a review" : "New review"}</h1>
      <section className="card">
        <p className="muted">The model predicts the product&apos;s core, surface and mean temperatures through the trace (lumped capacitance, or 1-D conduction when the Biot number calls for it); the limit set&apos;s rules are then judged on those channels and on the air.</p>
        <WriteGate permission="review:run">
        <ReviewForm
          traces={traces.map((t) => ({ id: t.id, label: `${t.name} (${t.sampleCount} samples)` }))}
          products={(await withVersion(products, q.product)).map(opt)}
          packs={(await withVersion(packs, q.pack)).map(opt)}
          limits={(await withVersion(limits, q.limits)).map(opt)}
          initial={{ trace: q.trace, product: q.product, pack: q.pack, limits: q.limits, model: q.model, corrects: corrects ? { id: corrects.id, title: corrects.title } : undefined }}
        />
        </WriteGate>
      </section>
    </>
  );
}
