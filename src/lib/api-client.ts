import type { ApiErrorBody, ErrorCode, FieldErrors } from '../../shared/schemas/common';

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

type Options = { method?: string; body?: unknown; query?: Record<string, string | number | boolean | undefined | null>; signal?: AbortSignal };

function withQuery(path: string, query?: Options['query']) {
  if (!query) return path;
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(query)) if (v !== undefined && v !== null && v !== '') params.set(k, String(v));
  const qs = params.toString();
  return qs ? `${path}?${qs}` : path;
}

export async function api<T>(path: string, { method = 'GET', body, query, signal }: Options = {}, retried = false): Promise<T> {
  const mutating = method !== 'GET' && method !== 'HEAD';
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (body !== undefined && !(body instanceof FormData)) headers['Content-Type'] = 'application/json';
  if (mutating) headers['X-CSRF-Token'] = csrfToken ?? (await fetchCsrfToken());
  const res = await fetch(withQuery(`/api${path}`, query), {
    method,
    headers,
    credentials: 'same-origin',
    signal,
    body: body === undefined ? undefined : body instanceof FormData ? body : JSON.stringify(body),
  });
  if (res.status === 204) return undefined as T;
  const data = (await res.json().catch(() => ({}))) as Partial<ApiErrorBody> & T;
  if (!res.ok) {
    // A new session (e.g. after the old one expired) has a new CSRF token: fetch it and retry once.
    if (data.error === 'csrf_invalid' && mutating && !retried) {
      await fetchCsrfToken();
      return api<T>(path, { method, body, query, signal }, true);
    }
    const code = data.error ?? 'unknown';
    throw new ApiError(res.status, code, messageFor(res.status, code, data.message ?? '', mutating), data.fields ?? []);
  }
  return data as T;
}
