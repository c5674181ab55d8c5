import { listTraces } from "@/lib/db/traces";
import { WriteGate } from "@/app/components/WriteGate";
import { listLatestDefinitions, getDefinition } from "@/lib/db/definitions";
import { getReview, latestReviewInputs } from "@/lib/db/reviews";
import Link from "next/link";
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
  // Without definitions in the address, start from the combination last used: the trace's own newest review,
  // else the newest review of any trace, each definition in its latest version (the lists offer only those).
  const chosen = q.product || q.pack || q.limits || q.model || corrects;
  const previous = chosen ? null : ((q.trace ? await latestReviewInputs(q.trace) : null) ?? (await latestReviewInputs()));
  const latestOf = (list: Array<{ id: string; lineage: string }>, lineage: string) => list.find((d) => d.lineage === lineage)?.id;
  const initial = previous
    ? {
        trace: q.trace,
        product: latestOf(products, previous.product.lineage),
        pack: previous.pack ? latestOf(packs, previous.pack.lineage) : "",
        limits: latestOf(limits, previous.limits.lineage),
        model: previous.model ?? undefined,
      }
    : { trace: q.trace, product: q.product, pack: q.pack, limits: q.limits, model: q.model };
  return (
    <>
      <h1>{corrects ? "Correct a review" : "New review"}</h1>
      <section className="card">
        <p className="muted">The model predicts the product&apos;s core, surface and mean temperatures through the trace (lumped capacitance, or 1-D conduction when the Biot number calls for it); the limit set&apos;s rules are then judged on those channels and on the air.</p>
        {previous && (
          <p className="muted" data-testid="preselected-from">
            Product, pack, limit set and model are preselected as in {q.trace && previous.traceId === q.trace ? "this trace's previous review" : "the most recent review"},{" "}
            <Link href={`/reviews/${previous.id}`}>{previous.title}</Link> (latest version of each); change them as needed.
          </p>
        )}
        <WriteGate permission="review:run">
        <ReviewForm
          traces={traces.map((t) => ({ id: t.id, label: `${t.name} (${t.sampleCount} samples)` }))}
          products={(await withVersion(products, q.product)).map(opt)}
          packs={(await withVersion(packs, q.pack)).map(opt)}
          limits={(await withVersion(limits, q.limits)).map(opt)}
          initial={{ ...initial, corrects: corrects ? { id: corrects.id, title: corrects.title } : undefined }}
        />
        </WriteGate>
      </section>
    </>
  );
}
