import { normalizeClaimNumber } from '../../shared/claims/claim-number';

// The free-text search of claims, one way for every list that offers it (the claims list and the review queue).
// Each claim carries its number, serials, site (name and city), contractor, product (model number and name) and
// narrative in `claims.search_text`, kept by triggers, with an InnoDB FULLTEXT index (migration ClaimSearch).
//
// What a search finds: a whole claim number (any case, spaces or dashes) is that claim alone. Otherwise the text is
// split at white space into terms, and a claim is found when its search text holds every term literally, case
// aside: `%` and `_` are characters like any other, never wildcards. The FULLTEXT index narrows the claims first
// (each word of a term of at least MIN_TOKEN characters must begin a word; only those with a digit when there are
// any), and `LOCATE` then checks each term as typed; a search whose every word is shorter (such as "LP" or "7K") is checked by `LOCATE` alone, over the
// organisation's claims, slower but still found.

/** InnoDB's default innodb_ft_min_token_size: shorter words are not in the index. */
export const MIN_TOKEN = 3;
/** InnoDB's default innodb_ft_max_token_size. */
const MAX_TOKEN = 84;

/** A condition on the claims under alias `c` and its parameters, for a `Conditions` or a list of clauses. */
export type SearchCondition = { sql: string; params: unknown[] };

/**
 * The words of a term as InnoDB's full-text parser reads them (letters, digits and `_`), for a boolean-mode
 * query: each must begin a word of the claim's text (`+word*`). A word touching an apostrophe is left out (the
 * parser may keep "o'neil" as one word), as is one too short or too long for the index, or made of `_` alone.
 */
function indexWords(term: string): string[] {
  const words: string[] = [];
  for (const m of term.matchAll(/[\p{L}\p{N}_]+/gu)) {
    const w = m[0];
    const before = term[m.index - 1];
    const after = term[m.index + w.length];
    if (before === "'" || before === '’' || after === "'" || after === '’') continue;
    if (w.length < MIN_TOKEN || w.length > MAX_TOKEN || /^_+$/.test(w)) continue;
    words.push(w);
  }
  return words;
}

/** The claims a search text finds, as a condition on alias `c`; null for an empty search (no condition). */
export function claimSearch(text: string | undefined | null): SearchCondition | null {
  const trimmed = text?.trim();
  if (!trimmed) return null;
  const exact = normalizeClaimNumber(trimmed);
  if (exact) return { sql: 'c.number = ?', params: [exact] };
  const terms = [...new Set(trimmed.split(/\s+/u))];
  const all = [...new Set(terms.flatMap(indexWords))];
  // InnoDB's full-text search costs time for every claim a word is in (about a second per 100,000 claims here),
  // however few the other words leave. A word with a digit (a serial, a number, a site's number) is in a few claims
  // at most: when there is one, the index is asked for those alone and LOCATE checks the rest.
  const withDigits = all.filter((w) => /\p{N}/u.test(w));
  const words = withDigits.length ? withDigits : all;
  const parts: string[] = [];
  const params: unknown[] = [];
  if (words.length) {
    parts.push('MATCH(c.search_text) AGAINST (? IN BOOLEAN MODE)');
    params.push(words.map((w) => `+${w}*`).join(' '));
  }
  for (const t of terms) {
    parts.push('LOCATE(?, c.search_text) > 0');
    params.push(t);
  }
  return { sql: parts.length > 1 ? `(${parts.join(' AND ')})` : parts[0], params };
}
