import { CAUTIONS } from "@/lib/review/cautions";

/** The caution every page with an outcome carries. */
export function Caution() {
  return (
    <aside className="caution" data-testid="caution" aria-label="Caution">
      {CAUTIONS.map((c) => (
        <p key={c}>{c}</p>
      ))}
    </aside>
  );
}
