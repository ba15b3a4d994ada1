import { Attachment } from './attachment.entity';
import { AuditEvent } from './audit-event.entity';
import { Invitation } from './invitation.entity';
import { LoginAttempt } from './login-attempt.entity';
import { Organization } from './organization.entity';
import { OutboxMessage } from './outbox-message.entity';
import { User } from './user.entity';

// The list TypeORM loads; explicit so that tsx and the bundler need no glob loading.
export const entities = [Organization, User, Invitation, AuditEvent, LoginAttempt, OutboxMessage, Attachment];
