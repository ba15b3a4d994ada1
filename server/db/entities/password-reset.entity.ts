import { Entity, Index } from 'typeorm';
import { SingleUseToken } from './single-use-token';

// A "forgot password" link: a single-use token that works for PASSWORD_RESET_TTL_MS
// (server/modules/passwords/passwords.service.ts).
@Entity({ name: 'password_resets' })
@Index('uq_password_resets_token_hash', ['tokenHash'], { unique: true })
export class PasswordReset extends SingleUseToken {}
