// The one way the client talks to the API: JSON in and out, same-origin cookies, errors as ApiError.
// No toasts or redirects in here: callers decide what an error means for the screen.

export type ApiErrorBody = { code: string; message: string; details?: { path: string; message: string }[] };

export class ApiError extends Error {
  constructor(
    public status: number,
    public code: string,
    message: string,
    public details: { path: string; message: string }[] = [],
  ) {
    super(message);
  }
}

export async function api<T>(path: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const { json, headers, ...rest } = init;
  let res: Response;
  try {
    res = await fetch(`/api${path}`, {
      credentials: 'same-origin',
      ...rest,
      headers: {
        Accept: 'application/json',
        ...(json !== undefined ? { 'Content-Type': 'application/json' } : {}),
        ...headers,
      },
      body: json !== undefined ? JSON.stringify(json) : rest.body,
    });
  } catch {
    throw new ApiError(0, 'network.offline', 'Cannot reach Lumenproof. Check the connection and try again.');
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  const body = text ? safeJson(text) : undefined;
  if (!res.ok) {
    const err = (body as { error?: ApiErrorBody } | undefined)?.error;
    throw new ApiError(
      res.status,
      err?.code ?? 'http.error',
      err?.message ?? `The server answered ${res.status}.`,
      err?.details ?? [],
    );
  }
  return body as T;
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

export function toQuery(params: Record<string, string | number | undefined | null>) {
  const sp = new URLSearchParams();
  for (const [k, v] of Object.entries(params))
    if (v !== undefined && v !== null && v !== '') sp.set(k, String(v));
  const s = sp.toString();
  return s ? `?${s}` : '';
}

/**
 * A fresh Idempotency-Key: made once per form start (or per action a user may repeat) and sent with every retry
 * of that request, so a double tap or a resend after a dropped answer does the thing once. getRandomValues works
 * where randomUUID does not (pages served over plain http on a LAN address).
 */
export function newIdempotencyKey(prefix: string) {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return `${prefix}-${Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('')}`;
}
