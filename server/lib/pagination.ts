import type { Paginated } from '../../shared/schemas/users';

export function pageOf<T>(items: T[], total: number, q: { page: number; pageSize: number }): Paginated<T> {
  return { items, total, page: q.page, pageSize: q.pageSize };
}

/** "-createdAt" → ["createdAt", "DESC"] */
export function parseSort<K extends string>(sort: K | `-${K}` | string, allowed: Record<string, string>) {
  const desc = sort.startsWith('-');
  const key = desc ? sort.slice(1) : sort;
  const column = allowed[key];
  if (!column) return null;
  return { column, direction: desc ? ('DESC' as const) : ('ASC' as const) };
}

/** Escapes LIKE wildcards in user search text. */
export const likeContains = (q: string) => `%${q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
