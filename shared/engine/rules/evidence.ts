import { finding, plural, runRules, type Rule, type RuleContext } from '../finding';
import type { Finding } from '../schema';

// Evidence: what the claim brings (photos, proof of purchase, serial) and what was seen on site.

export const photosRule: Rule = ({ input }) => {
  const { photos } = input.claim.evidence;
  const required = input.policy.requiredPhotos;
  if (photos >= required) return null;
  return finding(
    'evidence.photos_missing',
    'evidence',
    'warn',
    'review',
    `${photos} ${plural(photos, 'photo is', 'photos are')} attached; the policy asks for ${required} (the nameplate and the failure).`,
    { photos, requiredPhotos: required },
  );
};

export const proofOfPurchaseRule: Rule = ({ input }) => {
  if (!input.policy.proofOfPurchaseRequired || input.claim.evidence.proofOfPurchase) return null;
  return finding(
    'evidence.proof_of_purchase_missing',
    'evidence',
    'warn',
    'review',
    'No proof of purchase is attached; the policy requires one (an invoice or packing slip).',
    { proofOfPurchase: false, proofOfPurchaseRequired: true },
  );
};

export const serialRule: Rule = ({ input }) => {
  const serial = input.claim.evidence.serial;
  if (serial !== undefined && serial.trim() !== '') return null;
  return finding(
    'evidence.serial_missing',
    'evidence',
    'info',
    'none',
    'No serial number or date code is given; it is on the fixture label and lets the manufacturer trace the lot.',
    { serial: null },
  );
};

function observationRule(
  key: 'debrisIngress' | 'waterIngress' | 'physicalDamage' | 'fanStopped',
  code: string,
  message: string,
): Rule {
  return ({ input }) =>
    input.claim.observations?.[key] === true
      ? finding(code, 'evidence', 'warn', 'review', message, { [key]: true })
      : null;
}

export const debrisIngressRule = observationRule(
  'debrisIngress',
  'evidence.debris_ingress',
  'Debris or insects were found inside the fixture: a reviewer decides whether they caused the failure.',
);
export const waterIngressRule = observationRule(
  'waterIngress',
  'evidence.water_ingress',
  'Water was found inside the fixture: a reviewer decides whether the location or the seals are to blame.',
);
export const physicalDamageRule = observationRule(
  'physicalDamage',
  'evidence.physical_damage',
  'The fixture shows physical damage: a reviewer decides whether it came before or after the failure.',
);
export const fanStoppedRule = observationRule(
  'fanStopped',
  'evidence.fan_stopped',
  'The cooling fan has stopped: without it the LEDs and driver overheat, so a reviewer decides which failed first.',
);

export const evidenceDocumentRules: readonly Rule[] = [photosRule, proofOfPurchaseRule, serialRule];
export const observationRules: readonly Rule[] = [
  debrisIngressRule,
  waterIngressRule,
  physicalDamageRule,
  fanStoppedRule,
];

export function evidenceFindings(ctx: RuleContext, out: Finding[]): void {
  const before = out.length;
  runRules(evidenceDocumentRules, ctx, out);
  if (out.length === before) {
    const { photos, proofOfPurchase } = ctx.input.claim.evidence;
    out.push(
      finding(
        'evidence.complete',
        'evidence',
        'pass',
        'none',
        `The evidence is complete: ${photos} ${plural(photos, 'photo', 'photos')}, ${proofOfPurchase ? 'proof of purchase, ' : ''}serial number.`,
        { photos, requiredPhotos: ctx.input.policy.requiredPhotos, proofOfPurchase },
      ),
    );
  }
  runRules(observationRules, ctx, out);
}
