import { In, type EntityManager } from 'typeorm';
import { availableActions } from '../../../shared/claims/stages';
import type {
  BenchTestDto,
  ClaimDocumentDto,
  ClaimMessageDto,
  ClaimWorkflowDto,
  DecisionDto,
  ReturnAuthorizationDto,
} from '../../../shared/claims/workflow';
import { CONVERSATION_SENT } from '../../../shared/claims/workflow';
import type { SessionUser } from '../../auth/passport';
import { Attachment } from '../../db/entities/attachment.entity';
import { BenchTest } from '../../db/entities/bench-test.entity';
import { ClaimDocument } from '../../db/entities/claim-document.entity';
import { ClaimMessage } from '../../db/entities/claim-message.entity';
import type { Claim } from '../../db/entities/claim.entity';
import { Decision } from '../../db/entities/decision.entity';
import { Organization } from '../../db/entities/organization.entity';
import { ReturnAuthorization } from '../../db/entities/return-authorization.entity';
import { User } from '../../db/entities/user.entity';
import type { AppDataSource } from '../../db/data-source';
import { loadHistory } from '../../lib/history';
import { toAbilityUser } from '../../middleware/auth';
import { claimView, latestEvaluation, MOVES_ELSEWHERE } from './claim-actions.service';

// Everything the review screen and the installer's claim page show around a claim, in a fixed number of queries.
// People are named to their own organisation; the other side sees the organisation's name.

export function presentDocument(claimId: string, d: ClaimDocument): ClaimDocumentDto {
  return {
    id: d.id,
    kind: d.kind,
    filename: d.filename,
    sha256: d.sha256,
    byteSize: d.byteSize,
    createdAt: d.createdAt.toISOString(),
    url: `/api/claims/${claimId}/documents/${d.id}`,
  };
}

export async function loadWorkflow(
  ds: AppDataSource,
  claim: Claim,
  viewer: SessionUser,
): Promise<ClaimWorkflowDto> {
  const m: EntityManager = ds.manager;
  const [messages, returns, benches, decisions, documents, latest, history] = await Promise.all([
    m.find(ClaimMessage, { where: { claimId: claim.id }, order: { createdAt: 'ASC' } }),
    m.find(ReturnAuthorization, { where: { claimId: claim.id }, order: { createdAt: 'ASC' } }),
    m.find(BenchTest, { where: { claimId: claim.id }, order: { testedAt: 'ASC' } }),
    m.find(Decision, { where: { claimId: claim.id }, order: { decidedAt: 'DESC' } }),
    m.find(ClaimDocument, { where: { claimId: claim.id }, order: { createdAt: 'ASC' } }),
    latestEvaluation(m, claim),
    loadHistory(ds, 'Claim', claim.id, viewer.organizationId),
  ]);
  const userIds = new Set<string>();
  for (const x of messages) if (x.authorId) userIds.add(x.authorId);
  for (const x of benches) userIds.add(x.testedById);
  for (const x of decisions) userIds.add(x.decidedById);
  if (claim.assignedReviewerId) userIds.add(claim.assignedReviewerId);
  const messageIds = messages.map((x) => x.id);
  const [users, orgs, files] = await Promise.all([
    userIds.size
      ? m.find(User, {
          where: { id: In([...userIds]) },
          select: { id: true, name: true, organizationId: true },
        })
      : [],
    m.find(Organization, { where: { id: In([claim.contractorId, claim.manufacturerId]) } }),
    messageIds.length
      ? m.find(Attachment, {
          where: { ownerType: CONVERSATION_SENT, ownerId: In(messageIds) },
          order: { createdAt: 'ASC' },
        })
      : [],
  ]);
  const userById = new Map(users.map((u) => [u.id, u]));
  const orgById = new Map(orgs.map((o) => [o.id, o]));
  const docById = new Map(documents.map((d) => [d.id, d]));
  const nameOf = (userId: string | null, orgId: string) => {
    const u = userId ? userById.get(userId) : undefined;
    const org = orgById.get(orgId)?.name ?? '';
    return u && u.organizationId === viewer.organizationId ? u.name : org;
  };
  const doc = (id: string | null) => {
    const d = id ? docById.get(id) : undefined;
    return d ? presentDocument(claim.id, d) : null;
  };

  const messageDtos: ClaimMessageDto[] = messages.map((x) => ({
    id: x.id,
    kind: x.kind,
    body: x.body,
    author: {
      name: nameOf(x.authorId, x.authorOrgId),
      organization: orgById.get(x.authorOrgId)?.name ?? '',
      side: x.authorOrgId === claim.manufacturerId ? 'manufacturer' : 'contractor',
    },
    dueOn: x.dueOn,
    answeredAt: x.answeredAt?.toISOString() ?? null,
    createdAt: x.createdAt.toISOString(),
    attachments: files
      .filter((f) => f.ownerId === x.id)
      .map((f) => ({
        id: f.id,
        name: f.originalName,
        contentType: f.contentType,
        kind: f.kind,
        url: `/api/claims/${claim.id}/conversation/files/${f.id}`,
        thumbnailUrl: f.thumbnailKey ? `/api/claims/${claim.id}/conversation/files/${f.id}/thumbnail` : null,
      })),
  }));
  const returnDtos: ReturnAuthorizationDto[] = returns.map((r) => ({
    id: r.id,
    number: r.number,
    shipTo: r.shipTo,
    instructions: r.instructions,
    shipBy: r.shipBy,
    carrier: r.carrier,
    trackingNumber: r.trackingNumber,
    shippedOn: r.shippedOn,
    receivedOn: r.receivedOn,
    receivedCondition: r.receivedCondition,
    receivedNote: r.receivedNote,
    packingSlip: doc(r.packingSlipId),
    createdAt: r.createdAt.toISOString(),
  }));
  const benchDtos: BenchTestDto[] = benches.map((b) => ({
    id: b.id,
    testedOn: b.testedOn,
    result: b.result,
    readings: b.readings as Record<string, unknown>,
    evaluation: b.evaluation,
    engineVersion: b.engineVersion,
    note: b.note,
    testedBy: nameOf(b.testedById, claim.manufacturerId),
    testedAt: b.testedAt.toISOString(),
  }));
  const current = decisions.find((d) => d.currentClaimId === claim.id) ?? null;
  const decision: DecisionDto | null = current && {
    id: current.id,
    outcome: current.outcome,
    resolution: current.resolution,
    amount: current.amount,
    currency: current.currency,
    engineAmount: current.engineAmount,
    approvedUnits: current.approvedUnits,
    reasonCodes: current.reasonCodes,
    note: current.note,
    overrideReason: current.overrideReason,
    againstEngine: current.againstEngine,
    decidedBy: nameOf(current.decidedById, claim.manufacturerId),
    decidedAt: current.decidedAt.toISOString(),
    letter: doc(current.letterId),
  };
  const assignee = claim.assignedReviewerId ? userById.get(claim.assignedReviewerId) : undefined;
  const openRequest =
    [...messageDtos].reverse().find((x) => x.kind === 'info_request' && !x.answeredAt) ?? null;
  return {
    claim: {
      id: claim.id,
      number: claim.number,
      stage: claim.stage,
      waitingOn: claim.waitingOn,
      version: claim.version,
      stageChangedAt: claim.stageChangedAt.toISOString(),
      assignee:
        assignee && assignee.organizationId === viewer.organizationId
          ? { id: assignee.id, name: assignee.name }
          : null,
    },
    actions: availableActions(
      claimView(claim, latest.evaluation, latest.benchResult),
      toAbilityUser(viewer),
    ).filter((a) => !MOVES_ELSEWHERE[a]),
    openRequest: claim.stage === 'needs_info' ? openRequest : null,
    messages: messageDtos,
    returns: returnDtos,
    benchTests: benchDtos,
    decision,
    documents: documents.map((d) => presentDocument(claim.id, d)),
    history,
  };
}
