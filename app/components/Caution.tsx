import { CAUTIONS } from "@/lib/review/cautions";
import { DESIGN_CAUTIONS } from "@/lib/design/cautions";

const TEXTS = { review: CAUTIONS, design: DESIGN_CAUTIONS } as const;

/** The caution every page with an outcome carries: a review's (the default), or a design study's. */
export function Caution({ variant = "review" }: { variant?: keyof typeof TEXTS }) {
  return (
    <aside className="caution" data-testid="caution" data-variant={variant} aria-label="Caution">
      {TEXTS[variant].map((c) => (
        <p key={c}>{c}</p>
      ))}
    </aside>
  );
}
