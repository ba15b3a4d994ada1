import type { z } from 'zod';

import type { Action as AbilityAction, AbilityUser } from '../abilities';
import { formatCents, MONEY_PATTERN, parseCents } from '../engine/money';
import type { Verdict } from '../engine/schema';
import { ROLE_LABELS, type OrganizationKind, type Role } from '../roles';
import {
  BENCH_RESULT_LABELS,
  type BenchResult,
  answerInfoSchema,
  approveSchema,
  closeSchema,
  creditSchema,
  denySchema,
  fileClaimSchema,
  receiveUnitSchema,
  recordBenchTestSchema,
  recordShipmentSchema,
  reopenSchema,
  requestInfoSchema,
  requestReturnSchema,
  startReviewSchema,
  voidCreditSchema,
  withdrawSchema,
} from './actions.schema';

// The claim's stages and every move between them, defined once as data. Pure: the server checks a move with
// canPerform after loading the claim (and changes nothing when it is refused); the screens use
// availableActions to show only the buttons that would work.

export const STAGES = [
  'draft',
  'filed',
  'in_review',
  'needs_info',
  'return_requested',
  'unit_received',
  'approved',
  'denied',
  'credited',
  'closed',
  'withdrawn',
] as const;
export type Stage = (typeof STAGES)[number];

/** Plain words for the screens. */
export const STAGE_LABELS: Record<Stage, string> = {
  draft: 'Draft',
  filed: 'Filed, awaiting review',
  in_review: 'In review',
  needs_info: 'Waiting on installer',
  return_requested: 'Return requested',
  unit_received: 'Unit received',
  approved: 'Approved',
  denied: 'Denied',
  credited: 'Credited',
  closed: 'Closed',
  withdrawn: 'Withdrawn',
};

/** A claim at each stage, as the subject of a refusal: "A denied claim cannot be credited." */
const STAGE_SUBJECTS: Record<Stage, string> = {
  draft: 'A draft claim',
  filed: 'A filed claim that nobody has taken yet',
  in_review: 'A claim in review',
  needs_info: 'A claim waiting on the installer',
  return_requested: 'A claim waiting for its returned unit',
  unit_received: 'A claim whose unit has arrived',
  approved: 'An approved claim',
  denied: 'A denied claim',
  credited: 'A credited claim',
  closed: 'A closed claim',
  withdrawn: 'A withdrawn claim',
};

/** No action leaves these. */
export const FINAL_STAGES: readonly Stage[] = ['closed', 'withdrawn'];

export type ClaimSide = OrganizationKind;

/** Who acts: a signed-in user, or the server itself for automatic moves. */
export type ClaimActor = AbilityUser | 'system';

/** What the stage rules need to know about a claim. */
export type ClaimView = {
  stage: Stage;
  contractorId: string;
  manufacturerId: string;
  evaluation?: { verdict: Verdict; computed: { credit: string; currency?: string } } | null;
  /** What the newest bench test found, if the unit has been on the bench. */
  benchResult?: BenchResult | null;
};

type ActionDef = {
  /** Button wording. */
  label: string;
  from: readonly Stage[];
  /** The stage it moves to; a list when the payload chooses (the first is the default). */
  to: Stage | readonly [Stage, ...Stage[]];
  side: ClaimSide;
  roles: readonly Role[];
  /** The server may perform it with no user (actor 'system'). */
  automatic?: boolean;
  schema: z.ZodType;
  /** The audit log's action name. */
  audit: string;
  /** The CASL action on the claim the same actor must also hold (checked in the tests). */
  ability: AbilityAction;
  /** Which organisation hears about it by e-mail. */
  notifies: ClaimSide | null;
  /** Completes "Only an installer … can …". */
  does: string;
  /** Completes "A denied claim cannot …". */
  refusal: string;
};

// A contracting company's administrator may do whatever its installers may on a claim, as in the abilities.
const CONTRACTOR_ROLES = ['installer', 'administrator'] as const satisfies readonly Role[];

export const ACTIONS = {
  file: {
    label: 'File claim',
    from: ['draft'],
    to: 'filed',
    side: 'contractor',
    roles: CONTRACTOR_ROLES,
    schema: fileClaimSchema,
    audit: 'claim.filed',
    ability: 'file',
    notifies: 'manufacturer',
    does: 'file a claim',
    refusal: 'be filed again',
  },
  start_review: {
    label: 'Start review',
    from: ['filed'],
    to: 'in_review',
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: startReviewSchema,
    audit: 'claim.review_started',
    ability: 'review',
    notifies: null,
    does: 'take a claim into review',
    refusal: 'be taken into review',
  },
  request_info: {
    label: 'Ask the installer',
    from: ['in_review'],
    to: 'needs_info',
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: requestInfoSchema,
    audit: 'claim.info_requested',
    ability: 'review',
    notifies: 'contractor',
    does: 'ask the installer for information',
    refusal: 'be sent back to the installer with a question',
  },
  answer_info: {
    label: 'Send answer',
    from: ['needs_info'],
    to: 'in_review',
    side: 'contractor',
    roles: CONTRACTOR_ROLES,
    schema: answerInfoSchema,
    audit: 'claim.info_answered',
    ability: 'update',
    notifies: 'manufacturer',
    does: 'answer a request for information',
    refusal: 'be answered: no question is open',
  },
  request_return: {
    label: 'Request the unit back',
    from: ['in_review'],
    to: 'return_requested',
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: requestReturnSchema,
    audit: 'claim.return_requested',
    ability: 'review',
    notifies: 'contractor',
    does: 'request a return',
    refusal: 'have a return requested',
  },
  record_shipment: {
    label: 'Record shipment',
    from: ['return_requested'],
    to: 'return_requested',
    side: 'contractor',
    roles: CONTRACTOR_ROLES,
    schema: recordShipmentSchema,
    audit: 'claim.shipment_recorded',
    ability: 'update',
    notifies: 'manufacturer',
    does: 'record the return shipment',
    refusal: 'have a return shipment recorded',
  },
  receive_unit: {
    label: 'Mark unit received',
    from: ['return_requested'],
    to: 'unit_received',
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: receiveUnitSchema,
    audit: 'claim.unit_received',
    ability: 'review',
    notifies: 'contractor',
    does: 'mark a returned unit received',
    refusal: 'have a returned unit marked received',
  },
  record_bench_test: {
    label: 'Record bench test',
    from: ['unit_received'],
    to: ['unit_received', 'in_review'],
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: recordBenchTestSchema,
    audit: 'claim.bench_test_recorded',
    ability: 'review',
    notifies: null,
    does: 'record a bench test',
    refusal: 'have a bench test recorded',
  },
  approve: {
    label: 'Approve',
    from: ['in_review', 'unit_received'],
    to: 'approved',
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: approveSchema,
    audit: 'claim.approved',
    ability: 'decide',
    notifies: 'contractor',
    does: 'approve a claim',
    refusal: 'be approved',
  },
  deny: {
    label: 'Deny',
    from: ['in_review', 'unit_received'],
    to: 'denied',
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: denySchema,
    audit: 'claim.denied',
    ability: 'decide',
    notifies: 'contractor',
    does: 'deny a claim',
    refusal: 'be denied',
  },
  // A decision can be reopened (back to in review, with a written reason) until it is settled: an approved
  // claim before its credit (void the credit first), a denied claim before it is closed. Closed and withdrawn
  // claims stay final; new facts on those start a new claim.
  reopen: {
    label: 'Reopen decision',
    from: ['approved', 'denied'],
    to: 'in_review',
    side: 'manufacturer',
    roles: ['reviewer'],
    schema: reopenSchema,
    audit: 'claim.reopened',
    ability: 'decide',
    notifies: 'contractor',
    does: 'reopen a decision',
    refusal: 'be reopened',
  },
  credit: {
    label: 'Issue credit memo',
    from: ['approved'],
    to: 'credited',
    side: 'manufacturer',
    roles: ['accountant'],
    schema: creditSchema,
    audit: 'claim.credited',
    ability: 'credit',
    notifies: 'contractor',
    does: 'issue a credit',
    refusal: 'be credited',
  },
  void_credit: {
    label: 'Void credit memo',
    from: ['credited'],
    to: 'approved',
    side: 'manufacturer',
    roles: ['accountant'],
    schema: voidCreditSchema,
    audit: 'claim.credit_voided',
    ability: 'credit',
    notifies: 'contractor',
    does: 'void a credit',
    refusal: 'have a credit voided',
  },
  // The server closes settled claims itself (actor 'system'), e.g. after the period for questions runs out.
  close: {
    label: 'Close claim',
    from: ['denied', 'credited'],
    to: 'closed',
    side: 'manufacturer',
    roles: ['reviewer'],
    automatic: true,
    schema: closeSchema,
    audit: 'claim.closed',
    ability: 'review',
    notifies: null,
    does: 'close a claim',
    refusal: 'be closed',
  },
  withdraw: {
    label: 'Withdraw claim',
    from: ['draft', 'filed', 'needs_info'],
    to: 'withdrawn',
    side: 'contractor',
    roles: CONTRACTOR_ROLES,
    schema: withdrawSchema,
    audit: 'claim.withdrawn',
    ability: 'file',
    notifies: 'manufacturer',
    does: 'withdraw a claim',
    refusal: 'be withdrawn',
  },
} as const satisfies Record<string, ActionDef>;

export type ClaimActionName = keyof typeof ACTIONS;
export const ACTION_NAMES = Object.keys(ACTIONS) as ClaimActionName[];
export type ActionPayload<A extends ClaimActionName> = z.infer<(typeof ACTIONS)[A]['schema']>;

export const REFUSAL_CODES = [
  'claim.unknown_action',
  'claim.not_allowed',
  'claim.invalid_transition',
  'claim.invalid_payload',
] as const;
export type RefusalCode = (typeof REFUSAL_CODES)[number];

/** The HTTP status the API answers each refusal with. */
export const REFUSAL_STATUS: Record<RefusalCode, number> = {
  'claim.unknown_action': 400,
  'claim.not_allowed': 403,
  'claim.invalid_transition': 409,
  'claim.invalid_payload': 400,
};

export type Refusal = {
  ok: false;
  code: RefusalCode;
  message: string;
  details?: { path: string; message: string }[];
};
export type Allowed = { ok: true; to: Stage; payload?: unknown };

export function isActionName(name: string): name is ClaimActionName {
  return Object.prototype.hasOwnProperty.call(ACTIONS, name);
}

/** Every stage an action can lead to. */
export function targetsOf(action: ClaimActionName): readonly Stage[] {
  const to: Stage | readonly Stage[] = ACTIONS[action].to;
  return typeof to === 'string' ? [to] : to;
}

function sideOf(claim: ClaimView, actor: AbilityUser): ClaimSide | null {
  const org = actor.organization;
  if (org.kind === 'contractor' && org.id === claim.contractorId) return 'contractor';
  if (org.kind === 'manufacturer' && org.id === claim.manufacturerId) return 'manufacturer';
  return null;
}

function performs(claim: ClaimView, actor: ClaimActor, def: ActionDef): boolean {
  if (actor === 'system') return def.automatic === true;
  return sideOf(claim, actor) === def.side && actor.roles.some((r) => def.roles.includes(r));
}

function rolesText(roles: readonly Role[]): string {
  const names = roles.map((r) => ROLE_LABELS[r].toLowerCase());
  const list = names.length <= 1 ? names.join('') : `${names.slice(0, -1).join(', ')} or ${names.at(-1)}`;
  return /^[aeiou]/.test(list) ? `an ${list}` : `a ${list}`;
}

function notAllowed(claim: ClaimView, actor: ClaimActor, def: ActionDef): Refusal {
  const party = def.side === 'contractor' ? 'the contracting company' : 'the manufacturer';
  const message =
    actor !== 'system' && sideOf(claim, actor) === null
      ? 'This claim is not shared with your organisation.'
      : `Only ${rolesText(def.roles)} of ${party} on the claim can ${def.does}.`;
  return { ok: false, code: 'claim.not_allowed', message };
}

// Reasons

const sameCents = (a: string, b: string) =>
  MONEY_PATTERN.test(a) && MONEY_PATTERN.test(b) && parseCents(a) === parseCents(b);

/**
 * Whether a decision goes against the engine's verdict, so that the reviewer must write why: approving what the
 * engine found likely excluded, denying what it found likely covered, or deciding with no evaluation on record.
 * A `review` verdict recommends nothing either way.
 */
export function needsReason(verdict: Verdict | null | undefined, decision: 'approve' | 'deny'): boolean {
  if (verdict === null || verdict === undefined) return true;
  return decision === 'approve' ? verdict === 'excluded' : verdict === 'covered';
}

/** Why a decision on this claim needs an override reason; empty when it does not. */
export function overrideReasonsFor(
  claim: ClaimView,
  decision: { action: 'approve'; amount?: string } | { action: 'deny' },
): string[] {
  const ev = claim.evaluation ?? null;
  const why: string[] = [];
  if (ev === null) why.push('There is no engine evaluation on record.');
  else if (needsReason(ev.verdict, decision.action)) {
    why.push(
      decision.action === 'approve'
        ? 'The engine found this claim likely excluded.'
        : 'The engine found this claim likely covered.',
    );
  }
  // The bench outranks the screening: approving what the bench found sound, damaged or misapplied, or denying a
  // failure the bench confirmed, needs a written reason too.
  const bench = claim.benchResult ?? null;
  if (bench !== null && decision.action === 'approve' && bench !== 'failure_confirmed') {
    why.push(`The bench test found: ${BENCH_RESULT_LABELS[bench].toLowerCase()}.`);
  }
  if (bench === 'failure_confirmed' && decision.action === 'deny') {
    why.push('The bench test confirmed the failure.');
  }
  if (ev !== null && decision.action === 'approve' && decision.amount !== undefined) {
    if (!sameCents(decision.amount, ev.computed.credit)) {
      const engine = MONEY_PATTERN.test(ev.computed.credit)
        ? formatCents(parseCents(ev.computed.credit))
        : ev.computed.credit;
      const currency = ev.computed.currency ? ` ${ev.computed.currency}` : '';
      why.push(`The amount differs from the engine's credit of ${engine}${currency}.`);
    }
  }
  return why;
}

function pathText(path: readonly PropertyKey[]): string {
  return path.map(String).join('.');
}

function checkPayload(
  claim: ClaimView,
  action: ClaimActionName,
  payload: unknown,
): Refusal | { data: unknown } {
  const parsed = ACTIONS[action].schema.safeParse(payload);
  const details = parsed.success
    ? []
    : parsed.error.issues.map((i) => ({ path: pathText(i.path), message: i.message }));
  if (parsed.success && (action === 'approve' || action === 'deny')) {
    const data = parsed.data as { amount?: string; overrideReason?: string };
    const why =
      action === 'approve'
        ? overrideReasonsFor(claim, { action, amount: data.amount })
        : overrideReasonsFor(claim, { action });
    if (why.length > 0 && !data.overrideReason) {
      details.push({ path: 'overrideReason', message: `Give a reason for this decision. ${why.join(' ')}` });
    }
  }
  if (details.length > 0) {
    return {
      ok: false,
      code: 'claim.invalid_payload',
      message: 'Some of the details need another look.',
      details,
    };
  }
  return { data: (parsed as { data: unknown }).data };
}

function targetFor(action: ClaimActionName, payload: unknown): Stage {
  if (action === 'record_bench_test') {
    return (payload as { next?: string } | undefined)?.next === 'review' ? 'in_review' : 'unit_received';
  }
  return targetsOf(action)[0];
}

/**
 * Whether `actor` may perform `action` on `claim` now, and where it leads. Checks, in order: the action exists,
 * the actor is one who performs it on this claim (not_allowed), the claim's stage allows it
 * (invalid_transition), and, when a payload is given, the payload (invalid_payload, with each field).
 */
export function canPerform(
  claim: ClaimView,
  actor: ClaimActor,
  action: string,
  payload?: unknown,
): Allowed | Refusal {
  if (!isActionName(action)) {
    return {
      ok: false,
      code: 'claim.unknown_action',
      message: `There is no claim action called "${action}".`,
    };
  }
  const def: ActionDef = ACTIONS[action];
  if (!performs(claim, actor, def)) return notAllowed(claim, actor, def);
  if (!def.from.includes(claim.stage)) {
    return {
      ok: false,
      code: 'claim.invalid_transition',
      message: `${STAGE_SUBJECTS[claim.stage]} cannot ${def.refusal}.`,
    };
  }
  if (payload === undefined) return { ok: true, to: targetFor(action, undefined) };
  const checked = checkPayload(claim, action, payload);
  if ('ok' in checked) return checked;
  return { ok: true, to: targetFor(action, checked.data), payload: checked.data };
}

/** The actions `actor` could perform on `claim` at its stage, in the order of ACTIONS. */
export function availableActions(claim: ClaimView, actor: ClaimActor): ClaimActionName[] {
  return ACTION_NAMES.filter((a) => canPerform(claim, actor, a).ok);
}
