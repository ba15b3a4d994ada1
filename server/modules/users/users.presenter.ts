import type { MeDto, UserDto } from '../../../shared/schemas/users';
import type { SessionUser } from '../../auth/passport';
import type { User } from '../../db/entities/user.entity';

export function presentUser(u: User): UserDto {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    roles: u.roles,
    status: u.status,
    lastSignInAt: u.lastSignInAt ? u.lastSignInAt.toISOString() : null,
    createdAt: u.createdAt.toISOString(),
  };
}

export function presentMe(u: SessionUser): MeDto {
  return {
    id: u.id,
    email: u.email,
    name: u.name,
    roles: u.roles,
    organization: {
      id: u.organization.id,
      name: u.organization.name,
      kind: u.organization.kind,
      timeZone: u.organization.timeZone,
      locale: u.organization.locale,
    },
  };
}
