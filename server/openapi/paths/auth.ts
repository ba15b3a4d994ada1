import { z } from 'zod';
import {
  changePasswordSchema,
  forgotPasswordSchema,
  loginSchema,
  acceptInvitationSchema,
  resetPasswordSchema,
} from '../../../shared/schemas/auth';
import {
  confirmEnrollmentSchema,
  meSecondFactorSchema,
  removeSecondFactorSchema,
  secondFactorLoginSchema,
  secondFactorStatusSchema,
  sessionSchema,
} from '../../../shared/schemas/security';
import { meSchema } from '../../../shared/schemas/users';
import { instantSchema } from '../../../shared/schemas/answer-parts';
import { itemsOf, okSchema } from '../answers';
import { op, type Registry } from '../registry';

const tag = 'Sign-in and account';
const token = z.string().regex(/^[A-Za-z0-9_-]{20,100}$/);
const signedIn = z.object({ user: meSchema });

export function authPaths(reg: Registry) {
  op(reg, {
    method: 'get',
    path: '/api/health',
    tag: 'Service',
    summary: 'Is the service up',
    auth: 'public',
    answer: { json: z.object({ ok: z.literal(true), db: z.literal('up') }) },
    errors: [503],
  });
  op(reg, {
    method: 'get',
    path: '/api/openapi.json',
    tag: 'Service',
    summary: 'This document',
    auth: 'public',
    answer: {
      file: 'application/json',
      description: 'The OpenAPI 3.1 document (cached five minutes, with an ETag).',
    },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/login',
    tag,
    auth: 'public',
    summary: 'Sign in with e-mail and password',
    description:
      'Sets the session cookie. A person with a second factor gets `{ secondFactor: "required" }` and no session ' +
      'yet: send the code to `POST /api/auth/login/second-factor`. A wrong e-mail and a wrong password get the same 401.',
    body: loginSchema,
    answer: { json: z.union([signedIn, z.object({ secondFactor: z.literal('required') })]) },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/login/second-factor',
    tag,
    auth: 'public',
    summary: 'Finish signing in with a second-factor or recovery code',
    body: secondFactorLoginSchema,
    answer: { json: signedIn },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/logout',
    tag,
    auth: 'session',
    summary: 'Sign out (ends the session on the server)',
    status: 204,
    answer: { none: true },
  });
  op(reg, {
    method: 'get',
    path: '/api/auth/me',
    tag,
    summary: 'Who is signed in (or whose API token this is)',
    answer: {
      json: z.object({
        user: meSchema,
        app: z.object({ mode: z.string() }),
        secondFactor: meSecondFactorSchema,
      }),
    },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/password/forgot',
    tag,
    auth: 'public',
    summary: 'Ask for a link to choose a new password',
    description: 'The same answer whether or not the address has an account.',
    body: forgotPasswordSchema,
    status: 202,
    answer: { json: z.object({ ok: z.literal(true), message: z.string() }) },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/password/reset',
    tag,
    auth: 'public',
    summary: 'Choose a new password with the link’s token',
    body: resetPasswordSchema,
    answer: { json: z.object({ ok: z.literal(true), email: z.string() }) },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/password/change',
    tag,
    auth: 'session',
    summary: 'Change your own password',
    body: changePasswordSchema,
    answer: { json: okSchema },
  });
  op(reg, {
    method: 'get',
    path: '/api/auth/second-factor',
    tag,
    auth: 'session',
    summary: 'Your second factor’s state',
    answer: { json: secondFactorStatusSchema },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/second-factor/enrollment',
    tag,
    auth: 'session',
    summary: 'Start enrolling an authenticator app (TOTP)',
    answer: {
      json: z.object({ secret: z.string(), otpauthUrl: z.string(), qrSvg: z.string() }),
    },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/second-factor/enrollment/confirm',
    tag,
    auth: 'session',
    summary: 'Confirm the authenticator with a code; answers the recovery codes once',
    body: confirmEnrollmentSchema,
    answer: { json: z.object({ recoveryCodes: z.array(z.string()) }) },
  });
  op(reg, {
    method: 'delete',
    path: '/api/auth/second-factor',
    tag,
    auth: 'session',
    summary: 'Remove your second factor (with your password)',
    body: removeSecondFactorSchema,
    status: 204,
    answer: { none: true },
  });
  op(reg, {
    method: 'get',
    path: '/api/auth/sessions',
    tag,
    auth: 'session',
    summary: 'Your signed-in sessions (devices)',
    answer: {
      json: itemsOf(sessionSchema),
    },
  });
  op(reg, {
    method: 'post',
    path: '/api/auth/sessions/sign-out-others',
    tag,
    auth: 'session',
    summary: 'End every session of yours but this one',
    answer: { json: z.object({ ended: z.number().int().min(0) }) },
  });
  op(reg, {
    method: 'delete',
    path: '/api/auth/sessions/:id',
    tag,
    auth: 'session',
    summary: 'End one of your sessions',
    params: z.object({ id: z.string().min(1).max(64) }),
    status: 204,
    answer: { none: true },
  });
  op(reg, {
    method: 'get',
    path: '/api/invitations/:token',
    tag,
    auth: 'public',
    summary: 'Read an invitation from its link',
    params: z.object({ token }),
    answer: {
      json: z.object({
        invitation: z.object({
          email: z.string(),
          name: z.string(),
          organization: z.object({ name: z.string(), kind: z.enum(['manufacturer', 'contractor']) }),
          expiresAt: instantSchema,
        }),
      }),
    },
  });
  op(reg, {
    method: 'post',
    path: '/api/invitations/:token/accept',
    tag,
    auth: 'public',
    summary: 'Accept an invitation: choose a password',
    params: z.object({ token }),
    body: acceptInvitationSchema,
    answer: { json: z.object({ ok: z.literal(true), email: z.string() }) },
  });
}
