import type { EntityManager } from 'typeorm';
import type { Role } from '../../../shared/roles';
import type { Claim } from '../../db/entities/claim.entity';
import { User } from '../../db/entities/user.entity';

// Who hears of a claim by e-mail: one place for every move, filing and credit. Recipients are active members of
// the organisation, oldest account first. Where the claim names a person (its filer, its reviewer) who is still
// an active member, that person alone hears of it; otherwise the group does.

export type Recipient = { id: string; email: string; name: string };

/** Whom to tell, by what they are to the claim. */
export type Audience =
  /** Whoever filed it, else the contractor's installers and administrators. */
  | 'contractor'
  /** Its assigned reviewer, else every reviewer of the manufacturer. */
  | 'reviewer'
  /** A new claim: every reviewer of the manufacturer, else its administrators. */
  | 'intake'
  /** The manufacturer's accountants (an approval to credit). */
  | 'accountants'
  /** Credit memos: the contractor's administrators and whoever filed the claim. */
  | 'contractor_accounts'
  /** One named reviewer (a claim handed to them), else every reviewer. */
  | { reviewer: string };

type ClaimPeople = Pick<Claim, 'contractorId' | 'manufacturerId' | 'filedById' | 'assignedReviewerId'>;

async function activeMembers(m: EntityManager, organizationId: string): Promise<User[]> {
  return m.find(User, {
    where: { organizationId, status: 'active' },
    select: { id: true, email: true, name: true, roles: true, createdAt: true },
    order: { createdAt: 'ASC' },
  });
}

const withRoles = (users: User[], roles: Role[]) =>
  users.filter((u) => u.roles.some((r) => roles.includes(r)));

/** The named person if still an active member, else everyone with one of the roles. */
const personElse = (users: User[], id: string | null | undefined, roles: Role[]) => {
  const named = id ? users.find((u) => u.id === id) : undefined;
  return named ? [named] : withRoles(users, roles);
};

export async function recipientsOf(
  m: EntityManager,
  claim: ClaimPeople,
  audience: Audience,
): Promise<Recipient[]> {
  let users: User[];
  if (audience === 'contractor') {
    users = personElse(await activeMembers(m, claim.contractorId), claim.filedById, [
      'installer',
      'administrator',
    ]);
  } else if (audience === 'contractor_accounts') {
    users = (await activeMembers(m, claim.contractorId)).filter(
      (u) => u.roles.includes('administrator') || u.id === claim.filedById,
    );
  } else if (audience === 'reviewer') {
    users = personElse(await activeMembers(m, claim.manufacturerId), claim.assignedReviewerId, ['reviewer']);
  } else if (audience === 'intake') {
    const all = await activeMembers(m, claim.manufacturerId);
    const reviewers = withRoles(all, ['reviewer']);
    users = reviewers.length ? reviewers : withRoles(all, ['administrator']);
  } else if (audience === 'accountants') {
    users = withRoles(await activeMembers(m, claim.manufacturerId), ['accountant']);
  } else {
    users = personElse(await activeMembers(m, claim.manufacturerId), audience.reviewer, ['reviewer']);
  }
  return users.map((u) => ({ id: u.id, email: u.email, name: u.name }));
}
