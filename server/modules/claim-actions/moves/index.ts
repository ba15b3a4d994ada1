import { answerInfo } from './answer-info';
import { close } from './close';
import { approve, deny } from './decide';
import { receiveUnit } from './receive-unit';
import { recordBenchTest } from './record-bench-test';
import { recordShipment } from './record-shipment';
import { reopen } from './reopen';
import { requestInfo } from './request-info';
import { requestReturn } from './request-return';
import { startReview } from './start-review';
import type { HandledMove, MoveElsewhere, MoveHandler } from './types';
import { withdraw } from './withdraw';

/** One handler per move, keyed by the stage machine's action names (shared/claims/stages.ts). */
export const MOVES: { [K in HandledMove]: MoveHandler<K> } = {
  start_review: startReview,
  request_info: requestInfo,
  answer_info: answerInfo,
  request_return: requestReturn,
  record_shipment: recordShipment,
  receive_unit: receiveUnit,
  record_bench_test: recordBenchTest,
  approve,
  deny,
  reopen,
  close,
  withdraw,
};

/** Moves that have their own routes elsewhere: filing runs the engine (claims), credits belong to finance. */
export const MOVES_ELSEWHERE: Record<MoveElsewhere, string> = {
  file: 'POST /api/claims/:id/file',
  credit: 'POST /api/claims/:id/credits',
  void_credit: 'POST /api/credits/:id/void',
};
