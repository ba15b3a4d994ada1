import { TriangleAlert } from 'lucide-react';

/** PRODUCT.md "Safety": shown before every step that asks for a live reading. */
export function SafetyCallout() {
  return (
    <aside
      role="note"
      aria-label="Safety before measuring"
      className="rounded-lg border-2 border-warn-400 bg-warn-50 p-4 text-warn-950"
    >
      <p className="flex items-center gap-2 font-semibold">
        <TriangleAlert className="size-5 shrink-0" aria-hidden /> Before you take live readings
      </p>
      <ul className="mt-2 list-disc space-y-1 pl-5 text-sm">
        <li>
          Measurements on energised equipment can shock or burn. Only qualified persons should take them,
          following NFPA 70E and their employer&apos;s procedures.
        </li>
        <li>Wear suitable PPE and use meters rated for the circuit (CAT III or CAT IV).</li>
        <li>De-energise and lock out whenever possible. LED driver outputs can exceed 50 V DC.</li>
        <li>
          Do not bypass dead LEDs or swap drivers to take a reading: field modifications can void the
          fixture&apos;s listing and its warranty.
        </li>
      </ul>
    </aside>
  );
}
