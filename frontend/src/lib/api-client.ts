import { CSRF_HEADER } from '@common/api/roles';
import type { FieldIssue } from '@common/api/errors';

/**
 * The one way the browser talks to the API: base `/api`, same-origin cookies, JSON both ways, the CSRF
 * token on every state-changing request, and every non-2xx turned into an ApiError.
 */

const BASE = '/api';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: FieldIssue[],
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
type QueryValue = string | number | boolean | null | undefined;

export interface RequestOptions {
  body?: unknown;
  query?: Record<string, QueryValue>;
  signal?: AbortSignal;
  /**
   * What a 401 does: `redirect` (default) sends the person to sign in; `throw` only throws, for the
   * calls that expect it (the session probe, the sign-in itself).
   */
  on401?: 'redirect' | 'throw';
  /** Routes that need no CSRF token (the sign-in itself) skip fetching one. */
  skipCsrf?: boolean;
}

let csrfToken: string | null = null;
let csrfPending: Promise<string> | null = null;
let unauthorisedHandler: (() => void) | null = null;

/** Keeps the token the sign-in answer carries, so the next write needs no extra round trip. */
export function setCsrfToken(token: string | null): void {
  csrfToken = token;
}

/** Forgets the token; the next write fetches a fresh one (after sign-in and sign-out). */
export function clearCsrfToken(): void {
  csrfToken = null;
  csrfPending = null;
}

/** The app decides what "go and sign in" means (the router owns navigation). */
export function setUnauthorisedHandler(handler: (() => void) | null): void {
  unauthorisedHandler = handler;
}

async function getCsrfToken(): Promise<string> {
  if (csrfToken) return csrfToken;
  if (!csrfPending) {
    csrfPending = request<{ token: string }>('GET', '/auth/csrf', { on401: 'throw' })
      .then((r) => {
        csrfToken = r.token;
        return r.token;
      })
      .finally(() => {
        csrfPending = null;
      });
  }
  return csrfPending;
}

/** Builds `/api/...?a=1` from a path and query values; empty values are left out. */
export function apiUrl(path: string, query?: Record<string, QueryValue>): string {
  const search = new URLSearchParams();
  for (const [k, v] of Object.entries(query ?? {})) {
    if (v !== undefined && v !== null && v !== '') search.set(k, String(v));
  }
  const qs = search.toString();
  return `${BASE}${path}${qs ? `?${qs}` : ''}`;
}

async function readError(res: Response): Promise<ApiError> {
  let body: unknown = null;
  try {
    body = await res.json();
  } catch {
    // a proxy or gateway page is not our JSON error shape
  }
  const err = (body as { error?: { code?: unknown; message?: unknown; details?: unknown } } | null)?.error;
  if (err && typeof err.code === 'string' && typeof err.message === 'string') {
    const details = Array.isArray(err.details)
      ? (err.details as FieldIssue[]).filter((d) => d && typeof d.path === 'string' && typeof d.message === 'string')
      : undefined;
    return new ApiError(res.status, err.code, err.message, details);
  }
  return new ApiError(
    res.status,
    `http_${res.status}`,
    res.status >= 500 ? 'The server had a problem answering. Try again in a moment.' : `The request failed (HTTP ${res.status}).`,
  );
}

async function send(method: Method, path: string, options: RequestOptions): Promise<Response> {
  const headers: Record<string, string> = { Accept: 'application/json' };
  // A FormData body (a file upload) goes as multipart: the browser writes its Content-Type and boundary.
  const isForm = typeof FormData !== 'undefined' && options.body instanceof FormData;
  if (options.body !== undefined && !isForm) headers['Content-Type'] = 'application/json';
  if (method !== 'GET' && !options.skipCsrf) headers[CSRF_HEADER] = await getCsrfToken();
  try {
    return await fetch(apiUrl(path, options.query), {
      method,
      headers,
      credentials: 'same-origin',
      body: options.body === undefined ? undefined : isForm ? (options.body as FormData) : JSON.stringify(options.body),
      signal: options.signal,
    });
  } catch (e) {
    if ((e as Error)?.name === 'AbortError') throw e;
    throw new ApiError(0, 'network_error', 'Plenum cannot reach the server. Check the connection and try again.');
  }
}

async function request<T>(method: Method, path: string, options: RequestOptions = {}): Promise<T> {
  let res = await send(method, path, options);
  if (res.status === 403 && method !== 'GET') {
    const err = await readError(res.clone());
    if (err.code === 'csrf_failed') {
      // the session was renewed (sign-in elsewhere, server restart): fetch a fresh token once
      clearCsrfToken();
      res = await send(method, path, options);
    }
  }
  if (!res.ok) {
    const err = await readError(res);
    if (res.status === 401 && (options.on401 ?? 'redirect') === 'redirect') unauthorisedHandler?.();
    throw err;
  }
  if (res.status === 204) return undefined as T;
  const text = await res.text();
  return (text ? JSON.parse(text) : undefined) as T;
}

export const api = {
  get: <T>(path: string, options?: Omit<RequestOptions, 'body'>) => request<T>('GET', path, options),
  post: <T>(path: string, body?: unknown, options?: RequestOptions) => request<T>('POST', path, { ...options, body }),
  put: <T>(path: string, body: unknown, options?: RequestOptions) => request<T>('PUT', path, { ...options, body }),
  patch: <T>(path: string, body: unknown, options?: RequestOptions) => request<T>('PATCH', path, { ...options, body }),
  delete: <T>(path: string, options?: RequestOptions) => request<T>('DELETE', path, options),
  /** A multipart POST (a file and its form fields). */
  upload: <T>(path: string, form: FormData, options?: Omit<RequestOptions, 'body'>) => request<T>('POST', path, { ...options, body: form }),
};

/** A message fit for people, whatever was thrown. */
export function errorMessage(error: unknown): string {
  if (error instanceof ApiError) return error.message;
  if (error instanceof Error && error.message) return error.message;
  return 'Something went wrong.';
}
