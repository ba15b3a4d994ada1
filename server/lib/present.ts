// Helpers the presenters share. A presenter and the audit view of the same record name the same fields; they
// list them once and pick them here, so a field added to one cannot be forgotten in the other.

/** The named fields of a record, in the order named. */
export function pick<T extends object, K extends keyof T>(record: T, keys: readonly K[]): Pick<T, K> {
  const out = {} as Pick<T, K>;
  for (const k of keys) out[k] = record[k];
  return out;
}

/** An organisation as the answers name it; the name is empty when the relation was not loaded. */
export const orgRef = (id: string, org: { name: string } | null | undefined) => ({
  id,
  name: org?.name ?? '',
});

/** The stamps of a record that is edited under optimistic locking. */
export const stamps = (r: { createdAt: Date; updatedAt: Date; version: number }) => ({
  createdAt: r.createdAt.toISOString(),
  updatedAt: r.updatedAt.toISOString(),
  version: r.version,
});

/**
 * A person as the viewer may see them: by name to their own organisation; to the other side of a claim only as
 * their organisation, with no id (the same rule as a record's history, server/lib/history.ts).
 */
export function personRef(
  person: { id: string; name: string; organizationId: string } | null | undefined,
  org: { name: string } | null | undefined,
  viewerOrgId: string,
): { id: string | null; name: string } | null {
  if (!person) return null;
  return person.organizationId === viewerOrgId
    ? { id: person.id, name: person.name }
    : { id: null, name: org?.name ?? '' };
}
