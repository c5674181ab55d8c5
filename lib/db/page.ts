/** One page of a list: the rows, the total that match, and where this page sits. */
export interface Paged<T> {
  rows: T[];
  total: number;
  /** 1-based */
  page: number;
  pageSize: number;
  pages: number;
}

export interface PageRequest {
  /** 1-based; a page past the end gives the last page */
  page?: number;
  pageSize?: number;
}

export const DEFAULT_PAGE_SIZE = 50;
/** Larger pages are refused by clamping: a list page never loads a whole table. */
export const MAX_PAGE_SIZE = 200;

/** Resolves a page request against a total: page within 1…pages, size within 1…MAX_PAGE_SIZE. */
export function resolvePage(req: PageRequest, total: number): { page: number; pageSize: number; pages: number; skip: number } {
  const pageSize = Math.min(MAX_PAGE_SIZE, Math.max(1, Math.floor(req.pageSize ?? DEFAULT_PAGE_SIZE)));
  const pages = Math.max(1, Math.ceil(total / pageSize));
  const page = Math.min(pages, Math.max(1, Math.floor(req.page ?? 1)));
  return { page, pageSize, pages, skip: (page - 1) * pageSize };
}

/** A search text as typed: trimmed, at most 100 characters, undefined when blank. */
export function searchText(q: string | undefined): string | undefined {
  const t = q?.trim().slice(0, 100);
  return t ? t : undefined;
}
