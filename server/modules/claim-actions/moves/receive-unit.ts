import { ReturnAuthorization } from '../../../db/entities/return-authorization.entity';
import { moveClaim } from '../../claims/move-claim';
import { openReturnOf } from './returns';
import type { MoveHandler } from './types';

export const receiveUnit: MoveHandler<'receive_unit'> = async ({ m, claim, parties, tell, payload: p }) => {
  const ra = await openReturnOf(m, claim);
  const moved = await moveClaim(m, claim, 'unit_received');
  await m.update(
    ReturnAuthorization,
    { id: ra.id },
    { receivedOn: p.receivedOn, receivedCondition: p.condition, receivedNote: p.note ?? null },
  );
  const after = { returnNumber: ra.number, receivedOn: p.receivedOn, condition: p.condition };
  await tell('contractor', {
    headline: `${parties.manufacturer.name} received the returned unit`,
    details: [
      { label: 'Return number', value: ra.number },
      { label: 'Received', date: p.receivedOn },
    ],
    nextStep: 'The manufacturer tests the unit and then decides. Nothing is needed from you now.',
  });
  return { moved, after };
};
