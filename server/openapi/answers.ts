import { z } from 'zod';

// Small answer shapes that live only in a router (`{ ok: true }`, `{ items: [...] }`) and the marker for answers
// whose fields are not described one by one yet.

export const OPEN_MARK = 'Its fields are not described one by one in this document yet.';

/** An object answer the document names but does not spell out (yet): honest about it, for the test to count. */
export const openObject = (what: string) => z.looseObject({}).meta({ description: `${what}. ${OPEN_MARK}` });

export const itemsOf = <T extends z.ZodType>(item: T) => z.object({ items: z.array(item) });

export const okSchema = z.object({ ok: z.literal(true) });
