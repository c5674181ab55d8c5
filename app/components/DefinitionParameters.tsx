import Link from "next/link";
import { definitionParameters, describeRule, readableNumber } from "@/lib/review/parameters";

interface Def {
  id: string;
  kind: string;
  name: string;
  version: number;
  lineage: string;
  sha256: string;
  body: unknown;
}

const KIND_WORDS: Record<string, string> = { product: "Product", pack: "Pack", limits: "Limit set", profile: "Profile" };

const show = (v: string | number | boolean) => (typeof v === "number" ? readableNumber(v) : typeof v === "boolean" ? (v ? "yes" : "no") : v);

/**
 * Every parameter of one stored definition version, with its identity (id, version, full SHA-256): what
 * a report needs so that a reader can see the inputs without opening the database.
 */
export function DefinitionParameters({ def, link = true }: { def: Def; link?: boolean }) {
  const body = (def.body ?? {}) as { rules?: Array<Parameters<typeof describeRule>[0] & { id: string }> };
  const rules = def.kind === "limits" && Array.isArray(body.rules) ? body.rules : null;
  const rows = definitionParameters(rules ? { ...body, rules: undefined } : def.body);
  return (
    <div className="definition-parameters" data-testid={`parameters-${def.kind}`}>
      <h3 style={{ marginBottom: "0.3rem" }}>
        {KIND_WORDS[def.kind] ?? def.kind}: {link ? <Link href={`/definitions/${def.id}`}>{def.name}</Link> : def.name} (version {def.version})
      </h3>
      <p className="muted" style={{ margin: "0 0 0.4rem" }}>
        id <code>{def.id}</code> · SHA-256 <code className="hash">{def.sha256}</code>
      </p>
      <table>
        <tbody>
          {rows.map((r) => (
            <tr key={r.path} data-testid={`param-${def.kind}-${r.path}`}>
              <td>{r.label}</td>
              <td className="num">{show(r.value)}</td>
              <td>{r.unit}</td>
            </tr>
          ))}
          {rules?.map((r) => (
            <tr key={`rule-${r.id}`} data-testid={`param-${def.kind}-rule-${r.id}`}>
              <td>rule {r.id}</td>
              <td colSpan={2}>{describeRule(r)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
