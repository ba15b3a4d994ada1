import { ReturnAuthorization } from '../../../db/entities/return-authorization.entity';
import { moveClaim } from '../../claims/move-claim';
import { openReturnOf } from './returns';
import type { MoveHandler } from './types';

export const recordShipment: MoveHandler<'record_shipment'> = async ({ m, claim, tell, payload: p }) => {
  const ra = await openReturnOf(m, claim);
  const moved = await moveClaim(m, claim, 'return_requested', { waitingOn: 'manufacturer' });
  await m.update(
    ReturnAuthorization,
    { id: ra.id },
    { carrier: p.carrier, trackingNumber: p.trackingNumber, shippedOn: p.shippedOn },
  );
  const after = {
    returnNumber: ra.number,
    carrier: p.carrier,
    trackingNumber: p.trackingNumber,
    shippedOn: p.shippedOn,
  };
  await tell('manufacturer', {
    headline: `The unit is on its way (${ra.number})`,
    details: [
      { label: 'Carrier', value: p.carrier },
      { label: 'Tracking number', value: p.trackingNumber },
      { label: 'Shipped', date: p.shippedOn },
    ],
    nextStep: 'Mark the unit received when it arrives.',
  });
  return { moved, after };
};
