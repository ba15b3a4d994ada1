import crypto from 'node:crypto';
import type supertest from 'supertest';
import type { OrganizationKind, Role } from '../../shared/roles';
import { hashPassword } from '../../server/auth/passwords';
import type { AppDataSource } from '../../server/db/data-source';
import { Organization } from '../../server/db/entities/organization.entity';
import { User } from '../../server/db/entities/user.entity';

// Each test makes its own records: unique names, so that tests never depend on one another's data.
export const TEST_PASSWORD = 'correct horse battery staple';
let hashed: Promise<string> | null = null;
const passwordHash = () => (hashed ??= hashPassword(TEST_PASSWORD));
const unique = () => crypto.randomBytes(5).toString('hex');

export async function createOrganization(ds: AppDataSource, kind: OrganizationKind, name?: string) {
  const repo = ds.getRepository(Organization);
  return repo.save(
    repo.create({
      name: name ?? `${kind === 'manufacturer' ? 'Test Lighting' : 'Test Electric'} ${unique()}`,
      kind,
    }),
  );
}

export async function createUser(
  ds: AppDataSource,
  org: Organization,
  roles: Role[],
  extra: Partial<Pick<User, 'status' | 'name' | 'email'>> = {},
) {
  const repo = ds.getRepository(User);
  return repo.save(
    repo.create({
      organizationId: org.id,
      email: extra.email ?? `${roles[0]}-${unique()}@example.test`,
      name: extra.name ?? `Test ${roles[0]} ${unique()}`,
      roles,
      status: extra.status ?? 'active',
      passwordHash: await passwordHash(),
    }),
  );
}

/** Signs an agent in and returns it (the agent keeps the cookie). */
export async function signIn(agent: supertest.Agent, email: string, password = TEST_PASSWORD) {
  const res = await agent.post('/api/auth/login').send({ email, password });
  if (res.status !== 200)
    throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return agent;
}

export function sessionCookie(res: { headers: Record<string, unknown> }) {
  const raw = res.headers['set-cookie'];
  const list = Array.isArray(raw) ? raw : raw ? [String(raw)] : [];
  return list.find((c: string) => c.startsWith('lp.sid='))?.split(';')[0] ?? null;
}
