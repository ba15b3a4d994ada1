import { z } from 'zod';

// Every string a payload carries goes through str(): a lone UTF-16 surrogate (half of a pair, which JSON can carry
// as "\ud800" but no character encoding can store) is refused as a 400 that names the field, in the form and on
// the server alike, instead of failing later in the database or a PDF as a 500.

export const ILL_FORMED_TEXT =
  'This text holds a broken character (half of a UTF-16 surrogate pair); retype it.';

const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/** String.prototype.isWellFormed where the runtime has it (Node 20, current browsers), the same test otherwise. */
export function isWellFormedText(s: string): boolean {
  const native = (s as unknown as { isWellFormed?: () => boolean }).isWellFormed;
  return native ? native.call(s) : !LONE_SURROGATE.test(s);
}

/** z.string() that refuses ill-formed Unicode first; chain .trim(), .min(), .regex() … as on z.string(). */
export function str(params?: Parameters<typeof z.string>[0]) {
  return z.string(params).refine(isWellFormedText, { error: ILL_FORMED_TEXT, abort: true });
}
