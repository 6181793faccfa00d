/**
 * One page of a list that can grow without bound (studies over the years, a
 * lab's enrollments, the API's lists). Pages count from 1; a page number past
 * the end shows the last page.
 */
export const PAGE_SIZE = 25;

export type Page<T> = { rows: T[]; page: number; pageCount: number; total: number; pageSize: number };

/** The page asked for in `?<name>=`, 1 when missing or not a positive whole number. */
export function requestedPage(searchParams: URLSearchParams, name = "page") {
  const page = Number(searchParams.get(name));
  return Number.isSafeInteger(page) && page >= 1 ? page : 1;
}

export function pageCountOf(total: number, pageSize = PAGE_SIZE) {
  return Math.max(1, Math.ceil(total / pageSize));
}

/** Reads the total first, then the rows of the page asked for (clamped to the last page). */
export async function readPage<T>(page: number, total: () => Promise<number>, rows: (limit: number, offset: number) => Promise<T[]>, pageSize = PAGE_SIZE): Promise<Page<T>> {
  const count = await total();
  const pageCount = pageCountOf(count, pageSize);
  const shown = Math.min(page, pageCount);
  return { rows: await rows(pageSize, (shown - 1) * pageSize), page: shown, pageCount, total: count, pageSize };
}
