// The one typed client of Kernwright's HTTP API. Every response is checked against the shared
// zod schema; every failure becomes an ApiError carrying the API's { error: { code, message, details } }.
import { z } from 'zod';
import {
  signInResponseSchema,
  userSchema,
  type SignInRequest,
  type SignInResponse,
  type User,
} from '../shared/api/auth';
import { apiErrorSchema, fieldIssueSchema, type ErrorCode, type FieldIssue } from '../shared/api/errors';
import { healthSchema, type Health } from '../shared/api/health';
import {
  userListSchema,
  type CreateUserRequest,
  type ListUsersQuery,
  type UpdateUserRequest,
  type UserList,
} from '../shared/api/users';
import { currentToken, endSession } from './session';

/** Codes the client adds for failures that never reached the API's error shape. */
export type ClientErrorCode = 'network_error' | 'unreadable_response';

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: ErrorCode | ClientErrorCode | (string & {}),
    message: string,
    readonly fieldIssues: FieldIssue[] = [],
    readonly details: unknown = undefined,
  ) {
    super(message);
    this.name = 'ApiError';
  }
}

// Same origin by default (Express serves the app and the API); a separate dev server can point elsewhere.
const API_BASE_URL = process.env.EXPO_PUBLIC_API_BASE_URL ?? '';

type Method = 'GET' | 'POST' | 'PATCH' | 'DELETE';
type QueryValue = string | number | boolean | undefined;

interface RequestOptions<T> {
  method?: Method;
  body?: unknown;
  query?: Record<string, QueryValue>;
  /** Schema of a successful body; omit for 204 answers. */
  schema?: z.ZodType<T>;
  /** false for sign-in: a 401 there means wrong credentials, not an ended session. */
  authenticated?: boolean;
  signal?: AbortSignal;
}

const fieldIssuesSchema = z.object({ issues: z.array(fieldIssueSchema) });

function buildUrl(path: string, query?: Record<string, QueryValue>): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query ?? {})) {
    if (value !== undefined && value !== '') params.set(key, String(value));
  }
  const search = params.toString();
  return `${API_BASE_URL}${path}${search ? `?${search}` : ''}`;
}

async function readJson(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

function errorFromResponse(status: number, body: unknown): ApiError {
  const parsed = apiErrorSchema.safeParse(body);
  if (!parsed.success) {
    return new ApiError(status, status >= 500 ? 'internal' : 'unreadable_response', `The server answered ${status} without an explanation.`);
  }
  const { code, message, details } = parsed.data.error;
  const issues = fieldIssuesSchema.safeParse(details);
  return new ApiError(status, code, message, issues.success ? issues.data.issues : [], details);
}

async function request<T>(path: string, options: RequestOptions<T> = {}): Promise<T> {
  const { method = 'GET', body, query, schema, authenticated = true, signal } = options;
  const headers: Record<string, string> = { Accept: 'application/json' };
  if (body !== undefined) headers['Content-Type'] = 'application/json';
  const token = authenticated ? currentToken() : null;
  if (token) headers.Authorization = `Bearer ${token}`;

  let response: Response;
  try {
    response = await fetch(buildUrl(path, query), {
      method,
      headers,
      body: body === undefined ? undefined : JSON.stringify(body),
      signal,
    });
  } catch (cause) {
    if (signal?.aborted) throw cause;
    throw new ApiError(0, 'network_error', 'Kernwright’s server could not be reached.');
  }

  const payload = await readJson(response);
  if (!response.ok) {
    const error = errorFromResponse(response.status, payload);
    if (response.status === 401 && authenticated) endSession('expired');
    throw error;
  }
  if (!schema) return undefined as T;
  const parsed = schema.safeParse(payload);
  if (!parsed.success) {
    throw new ApiError(response.status, 'unreadable_response', 'The server sent an answer this version of the app cannot read.');
  }
  return parsed.data;
}

// Auth

export function signIn(credentials: SignInRequest): Promise<SignInResponse> {
  return request('/api/auth/sign-in', {
    method: 'POST',
    body: credentials,
    schema: signInResponseSchema,
    authenticated: false,
  });
}

const currentUserSchema = z.object({ user: userSchema });

export async function fetchCurrentUser(signal?: AbortSignal): Promise<User> {
  const { user } = await request('/api/auth/me', { schema: currentUserSchema, signal });
  return user;
}

export function signOut(): Promise<void> {
  return request<void>('/api/auth/sign-out', { method: 'POST' });
}

// Health

export function fetchHealth(signal?: AbortSignal): Promise<Health> {
  return request('/api/health', { schema: healthSchema, authenticated: false, signal });
}

// Users (administrators only)

/** The list query with its page numbers as numbers (the shared schema also accepts them as text). */
export type ListUsersParams = Omit<ListUsersQuery, 'limit' | 'offset'> & { limit: number; offset: number };

export function listUsers(query: ListUsersParams, signal?: AbortSignal): Promise<UserList> {
  return request('/api/users', {
    query: { q: query.q, role: query.role, active: query.active, limit: query.limit, offset: query.offset },
    schema: userListSchema,
    signal,
  });
}

export function createUser(body: CreateUserRequest): Promise<User> {
  return request('/api/users', { method: 'POST', body, schema: userSchema });
}

export function updateUser(id: string, changes: UpdateUserRequest): Promise<User> {
  return request(`/api/users/${encodeURIComponent(id)}`, { method: 'PATCH', body: changes, schema: userSchema });
}
