import Link from "next/link";

/**
 * "Showing 51–100 of 312" and links to the first, previous, next and last pages, keeping the list's
 * other parameters (filters, search) in the address.
 */
export function Pager({ path, params, page, pages, total, pageSize, noun }: { path: string; params: Record<string, string | undefined>; page: number; pages: number; total: number; pageSize: number; noun: string }) {
  const href = (p: number) => {
    const q = new URLSearchParams(Object.entries({ ...params, page: p > 1 ? String(p) : undefined }).filter((e): e is [string, string] => !!e[1]));
    const s = q.toString();
    return s ? `${path}?${s}` : path;
  };
  const first = total === 0 ? 0 : (page - 1) * pageSize + 1;
  const last = Math.min(total, page * pageSize);
  return (
    <nav className="pager no-print" aria-label={`Pages of ${noun}`} data-testid="pager">
      <span data-testid="pager-summary">{total === 0 ? `No ${noun}` : `${noun[0]!.toUpperCase()}${noun.slice(1)} ${first}–${last} of ${total}`}</span>
      {pages > 1 && (
        <span className="pager-links">
          {page > 1 ? <><Link href={href(1)}>« first</Link> <Link href={href(page - 1)} rel="prev">‹ previous</Link></> : <span className="muted">« first ‹ previous</span>}
          <span> page {page} of {pages} </span>
          {page < pages ? <><Link href={href(page + 1)} rel="next">next ›</Link> <Link href={href(pages)}>last »</Link></> : <span className="muted">next › last »</span>}
        </span>
      )}
    </nav>
  );
}

/** A search box that keeps the list's other parameters as hidden fields and starts again at page 1. */
export function SearchBox({ params, q, label, placeholder }: { params: Record<string, string | undefined>; q?: string; label: string; placeholder: string }) {
  return (
    <form role="search" className="no-print search-form" aria-label={label}>
      {Object.entries(params).map(([k, v]) => (k !== "q" && k !== "page" && v ? <input key={k} type="hidden" name={k} value={v} /> : null))}
      <label>{label} <input type="search" name="q" defaultValue={q} placeholder={placeholder} maxLength={100} data-testid="search-input" /></label>
      <button type="submit" className="secondary">Search</button>
    </form>
  );
}
