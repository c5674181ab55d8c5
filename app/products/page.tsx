import { listLatestDefinitions } from "@/lib/db/definitions";
import { bareProductSchema, type BareProduct } from "@/lib/thermal/product";
import { readableDuration, screenBareProduct } from "@/lib/thermal/screening";
import { ProductForm } from "./ProductForm";

export const dynamic = "force-dynamic";

export default async function ProductsPage({ searchParams }: { searchParams: Promise<{ saved?: string }> }) {
  const { saved } = await searchParams;
  const products = await listLatestDefinitions<BareProduct>("product");
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
              <tr><th>Name</th><th className="num">Version</th><th className="num">Mass (kg)</th><th className="num">cp (J/kg·K)</th><th className="num">h·A (W/K)</th><th className="num">tau</th><th className="num">Bi</th></tr>
            </thead>
            <tbody>
              {products.map((p) => {
                const body = bareProductSchema.safeParse(p.body);
                if (!body.success) return <tr key={p.id}><td>{p.name}</td><td colSpan={6}>stored definition no longer valid</td></tr>;
                const s = screenBareProduct(body.data);
                return (
                  <tr key={p.id}>
                    <td>{p.name}</td>
                    <td className="num">{p.version}</td>
                    <td className="num">{body.data.mass_kg}</td>
                    <td className="num">{body.data.properties.cp_J_kgK}</td>
                    <td className="num">{(body.data.h_W_m2K * body.data.area_m2).toPrecision(3)}</td>
                    <td className="num">{readableDuration(s.tau_s)}</td>
                    <td className="num">{s.biot === null ? "–" : s.biot.toPrecision(2)}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        )}
      </section>
      <section className="card">
        <h2 style={{ marginTop: 0 }}>Define a product</h2>
        <ProductForm />
      </section>
    </>
  );
}
