import Link from "next/link";
import { WriteGate } from "@/app/components/WriteGate";
import { getDefinition, listLatestDefinitions } from "@/lib/db/definitions";
import { productSchema, type Pack, type Product } from "@/lib/thermal/definitions";
import { screenDefinition } from "@/lib/thermal/predict";
import { ProductEditor } from "./ProductEditor";
import { sig, sigTrim } from "@/lib/display/numbers";

export const dynamic = "force-dynamic";

function describeShape(p: Product): string {
  if (!p.shape) return "no shape (lumped)";
  const { kind, ...dims } = p.shape;
  return `${kind} ${Object.values(dims).map((v) => `${Number((v * 1000).toPrecision(4))}`).join(" × ")} mm`;
}

export default async function ProductsPage({ searchParams }: { searchParams: Promise<{ saved?: string; edit?: string }> }) {
  const { saved, edit } = await searchParams;
  const [products, packs] = await Promise.all([listLatestDefinitions<Product>("product"), listLatestDefinitions<Pack>("pack")]);
  const editing = edit ? await getDefinition<Product>(edit) : null;
  return (
    <>
      <h1>Products</h1>
      {saved && <p className="muted" data-testid="saved-note">Product saved.</p>}
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Stored products</h2>
        {products.length === 0 ? (
          <p className="muted">No products yet.</p>
        ) : (
          <table data-testid="product-list">
            <thead>
              <tr><th>Name</th><th className="num">Version</th><th>Shape</th><th>Properties</th><th className="num">tau (own h)</th><th className="num">Bi</th><th /></tr>
            </thead>
            <tbody>
              {products.map((p) => {
                const body = productSchema.safeParse(p.body);
                if (!body.success) return <tr key={p.id}><td>{p.name}</td><td colSpan={6}>stored definition no longer valid</td></tr>;
                const s = body.data.h_W_m2K !== undefined ? screenDefinition(body.data, undefined) : null;
                return (
                  <tr key={p.id}>
                    <td>{p.name}</td>
                    <td className="num">{p.version}</td>
                    <td>{describeShape(body.data)}</td>
                    <td>{body.data.composition ? `composition${body.data.freezing_point_C !== undefined ? `, freezes at ${sigTrim(body.data.freezing_point_C, 3)} °C` : ""}` : `cp ${sigTrim(body.data.properties!.cp_J_kgK, 4)} J/kg·K`}</td>
                    <td className="num">{s ? s.tau_readable : "with a pack"}</td>
                    <td className="num">{s?.biot == null ? "–" : sig(s.biot, 2)}</td>
                    <td><Link href={`/products?edit=${p.id}`}>Edit</Link></td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>{editing ? `Edit ${editing.name}` : "Define a product"}</h2>
        <WriteGate permission="definition:edit">
        <ProductEditor
          key={editing?.id ?? "new"}
          editing={editing && editing.kind === "product" ? { id: editing.id, lineage: editing.lineage, version: editing.version, body: editing.body } : undefined}
          packs={packs.map((p) => ({ id: p.id, name: `${p.name} v${p.version}`, body: p.body }))}
        />
        </WriteGate>
      </section>
    </>
  );
}
