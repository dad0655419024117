import 'server-only';
// Collects every page of a list for CSV export (same filters and order as the table on screen).
import type { Page } from '@/db/sites';

const MAX_EXPORT_ROWS = 50_000;

export async function collectAll<T>(fetchPage: (page: number, pageSize: number) => Promise<Page<T>>): Promise<T[]> {
  const out: T[] = [];
  for (let page = 1; out.length < MAX_EXPORT_ROWS; page++) {
    const p = await fetchPage(page, 100);
    out.push(...p.items);
    if (out.length >= p.total || p.items.length === 0) break;
  }
  return out;
}

/** Export links pass the table's query minus paging; the list schemas want page fields to parse. */
export function exportQuery(req: Request): Request {
  const url = new URL(req.url);
  url.searchParams.delete('page');
  url.searchParams.delete('pageSize');
  return new Request(url, { headers: req.headers });
}
