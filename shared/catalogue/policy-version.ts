// Which version of a warranty policy judges an installation: the latest one in force on the day the units
// were bought, or installed when there is no purchase date. A later edit never reaches back.

export type DatedVersion = { versionNumber: number; effectiveFrom: string };

/** The day that picks the version: the purchase date, else the install date (both YYYY-MM-DD). */
export const coverageDate = (i: { purchaseDate?: string | null; installDate: string }) =>
  i.purchaseDate ?? i.installDate;

/** The latest version with effectiveFrom on or before `date`; null when none was in force yet. */
export function versionInForce<V extends DatedVersion>(versions: readonly V[], date: string): V | null {
  let best: V | null = null;
  for (const v of versions) {
    if (v.effectiveFrom > date) continue; // ISO dates compare as strings
    if (
      !best ||
      v.effectiveFrom > best.effectiveFrom ||
      (v.effectiveFrom === best.effectiveFrom && v.versionNumber > best.versionNumber)
    )
      best = v;
  }
  return best;
}
