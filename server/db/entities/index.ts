import { AccountingMap } from './accounting-map.entity';
import { Attachment } from './attachment.entity';
import { ApiToken } from './api-token.entity';
import { AuditEvent } from './audit-event.entity';
import { BenchTest } from './bench-test.entity';
import { ClaimBatch } from './claim-batch.entity';
import { ClaimCount } from './claim-count.entity';
import { ClaimDocument } from './claim-document.entity';
import { ClaimMessage } from './claim-message.entity';
import { Claim } from './claim.entity';
import { Decision } from './decision.entity';
import { CreditApproval } from './credit-approval.entity';
import { CreditMemo } from './credit-memo.entity';
import { IdempotencyKey } from './idempotency-key.entity';
import { InstallationUnit } from './installation-unit.entity';
import { Installation } from './installation.entity';
import { Invitation } from './invitation.entity';
import { LedgerEntry } from './ledger-entry.entity';
import { LoginLimit } from './login-limit.entity';
import { MemoPrefix, MemoSequence } from './memo-sequence.entity';
import { Organization } from './organization.entity';
import { OutboxMessage } from './outbox-message.entity';
import { PasswordResetRequest } from './password-reset-request.entity';
import { PasswordReset } from './password-reset.entity';
import { PolicyModel } from './policy-model.entity';
import { ProductModel } from './product-model.entity';
import { RecoveryCode } from './recovery-code.entity';
import { ReturnAuthorization } from './return-authorization.entity';
import { SignInChallenge } from './sign-in-challenge.entity';
import { User } from './user.entity';
import { WebhookDelivery, WebhookEndpoint } from './webhook.entity';
import { SavedView } from './saved-view.entity';
import { WaitingMailSetting } from './waiting-mail-setting.entity';
import { WaitingRead } from './waiting-read.entity';
import { WarrantyPolicyVersion } from './warranty-policy-version.entity';
import { WarrantyPolicy } from './warranty-policy.entity';

// The list TypeORM loads; explicit so that tsx and the bundler need no glob loading.
export const entities = [
  Organization,
  User,
  Invitation,
  AuditEvent,
  LoginLimit,
  OutboxMessage,
  ProductModel,
  WarrantyPolicy,
  WarrantyPolicyVersion,
  PolicyModel,
  Installation,
  InstallationUnit,
  Claim,
  ClaimCount,
  ClaimBatch,
  Attachment,
  ClaimMessage,
  ReturnAuthorization,
  BenchTest,
  Decision,
  ClaimDocument,
  CreditMemo,
  PasswordReset,
  PasswordResetRequest,
  AccountingMap,
  CreditApproval,
  SavedView,
  WaitingRead,
  WaitingMailSetting,
  LedgerEntry,
  MemoSequence,
  MemoPrefix,
  IdempotencyKey,
  RecoveryCode,
  SignInChallenge,
  ApiToken,
  WebhookEndpoint,
  WebhookDelivery,
];
