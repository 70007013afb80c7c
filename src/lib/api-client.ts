import { IDEMPOTENCY_HEADER, type ApiErrorBody, type ErrorCode, type FieldErrors } from '../../shared/schemas/common';

/**
 * An error answer from the API, with field errors to map back onto a form. Besides the server's
 * codes: `network` when no answer came, `unknown` when the answer carried no code (e.g. a proxy's page).
 */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode | 'network' | 'unknown',
    message: string,
    readonly fields: FieldErrors = [],
  ) {
    super(message);
  }
}

/**
 * The words people see for an answer that has nothing to do with what they typed. A database
 * outage is passing and nothing was half-saved (writes are all-or-nothing), so the notice says
 * exactly that instead of sounding like a fault in their entry.
 */
export function messageFor(status: number, code: ApiError['code'], serverMessage: string, mutating: boolean): string {
  if (code === 'database_unavailable') {
    return mutating
      ? 'The database is not answering; your entry was not saved, try again in a moment.'
      : 'The database is not answering; try again in a moment.';
  }
  return serverMessage || `Request failed (${status})`;
}

/** A passing outage is a caution, not an alarm: nothing the person did was wrong. */
export const isPassingOutage = (err: unknown): boolean => err instanceof ApiError && err.code === 'database_unavailable';

let csrfToken: string | null = null;

export function setCsrfToken(token: string | null) {
  csrfToken = token;
}

async function fetchCsrfToken(): Promise<string> {
  const res = await fetch('/api/auth/csrf', { credentials: 'same-origin' });
  const body = (await res.json()) as { token: string };
  csrfToken = body.token;
  return body.token;
}

type Options = {
  method?: string;
  body?: unknown;
  query?: Record<string, string | number | boolean | undefined | null>;
  signal?: AbortSignal;
  /**
   * Send an `Idempotency-Key`: one fresh key per call (a call is one submit of a form or dialog),
   * kept by the retries below, so a write whose answer was lost is carried out once.
   */
  idempotent?: boolean;
};

/** Random hex; crypto.randomUUID exists only on https or localhost, and a shop's tablets may reach the server over plain http. */
function newIdempotencyKey(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return Array.from(bytes, (b) => b.toString(16).padStart(2, '0')).join('');
}

/** How often an idempotent write is sent again when no answer came (a dropped connection on the shop floor). */
const NETWORK_RETRIES = 2;
const RETRY_PAUSE_MS = 800;

function withQuery(path: string, query?: Options['query']) {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== null && v !== '') params.set(k, String(v));
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

export async function api<T>(path: string, options: Options = {}): Promise<T> {
  return send<T>(path, options, options.idempotent && options.method && options.method !== 'GET' ? newIdempotencyKey() : null, false);
}

async function send<T>(path: string, options: Options, idempotencyKey: string | null, retried: boolean): Promise<T> {
  const { method = 'GET', body, query, signal } = options;
  const mutating = method !== 'GET' && method !== 'HEAD';
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (body !== undefined && !(body instanceof FormData)) headers['Content-Type'] = 'application/json';
  if (mutating) headers['X-CSRF-Token'] = csrfToken ?? (await fetchCsrfToken());
  if (idempotencyKey) headers[IDEMPOTENCY_HEADER] = idempotencyKey;
  const init: RequestInit = {
    method,
    headers,
    credentials: 'same-origin',
    signal,
    body: body === undefined ? undefined : body instanceof FormData ? body : JSON.stringify(body),
  };
  let res: Response | null = null;
  for (let attempt = 0; !res; attempt++) {
    try {
      res = await fetch(withQuery(`/api${path}`, query), init);
    } catch (err) {
      // Only a write the server can recognise again is sent twice.
      if (!idempotencyKey || signal?.aborted || attempt >= NETWORK_RETRIES) throw err;
      await new Promise((resolve) => setTimeout(resolve, RETRY_PAUSE_MS * (attempt + 1)));
    }
  }
  if (res.status === 204) return undefined as T;
  const data = (await res.json().catch(() => ({}))) as Partial<ApiErrorBody> & T;
  if (!res.ok) {
    // A new session (e.g. after the old one expired) has a new CSRF token: fetch it and retry once.
    if (data.error === 'csrf_invalid' && mutating && !retried) {
      await fetchCsrfToken();
      return send<T>(path, options, idempotencyKey, true);
    }
    const code = data.error ?? 'unknown';
    throw new ApiError(res.status, code, messageFor(res.status, code, data.message ?? '', mutating), data.fields ?? []);
  }
  return data as T;
}
