import crypto from 'node:crypto';
import { addDays, newReturnNumber, RETURN_SHIP_DAYS } from '../../../../shared/claims/workflow';
import { ReturnAuthorization } from '../../../db/entities/return-authorization.entity';
import { moveClaim } from '../../claims/move-claim';
import { createPackingSlip } from '../claim-documents';
import type { MoveHandler } from './types';

export const requestReturn: MoveHandler<'request_return'> = async ({
  m,
  claim,
  user,
  now,
  today,
  parties,
  storage,
  tell,
  payload: p,
}) => {
  const moved = await moveClaim(m, claim, 'return_requested');
  let number = newReturnNumber(now, (n) => crypto.randomInt(n));
  while (await m.exists(ReturnAuthorization, { where: { number } })) {
    number = newReturnNumber(now, (n) => crypto.randomInt(n));
  }
  const ra = m.create(ReturnAuthorization, {
    id: crypto.randomUUID(),
    number,
    claimId: claim.id,
    shipTo: p.shipTo,
    instructions: p.instructions ?? null,
    shipBy: addDays(today, RETURN_SHIP_DAYS),
    requestedById: user.id,
  });
  const slip = await createPackingSlip(m, storage, claim, parties, ra, now);
  ra.packingSlipId = slip.id;
  await m.insert(ReturnAuthorization, ra);
  const after = { returnNumber: number, packingSlipSha256: slip.sha256 };
  await tell('contractor', {
    headline: `${parties.manufacturer.name} asks for the unit back`,
    intro: `Return authorisation ${number}: print the packing slip, put it in the box, and ship the unit to the address below.`,
    quote: p.instructions,
    details: [
      { label: 'Return number', value: number },
      {
        label: 'Ship to',
        value: [p.shipTo.name, p.shipTo.line1, p.shipTo.city, p.shipTo.postalCode, p.shipTo.country].join(
          ', ',
        ),
      },
      { label: 'Ship by', date: ra.shipBy },
    ],
    nextStep: 'Record the carrier and tracking number on the claim once the box is on its way.',
    attachments: [{ filename: slip.filename, contentType: 'application/pdf', storageKey: slip.storageKey }],
  });
  return { moved, after };
};
