// The one wrapper every route handler goes through: it resolves the session, validates the URL
// parameters, query and body with zod, checks the action through the permissions module, runs
// the handler and answers JSON. Errors become `{ error, field? }` with 400/401/403/404/409/429;
// anything unexpected is logged here and answered as a bare 500, never with a stack trace.
import type { NextRequest } from 'next/server';
import type { z } from 'zod';
import {
  AccessError,
  authorizeDerivation,
  authorizeGroup,
  type Action,
  type DerivationAccess,
  type GroupAccess,
} from '../permissions';
import { sessionUserFromCookies, type SessionUser } from '../session';
import { ApiError } from './errors';

const MAX_BODY_BYTES = 1_000_000;

type Auth = 'public' | 'optional' | 'user';
type UserFor<A extends Auth> = A extends 'user' ? SessionUser : SessionUser | null;

export interface RouteSpec<P, Q, B, A extends Auth> {
  params?: z.ZodType<P>;
  query?: z.ZodType<Q>;
  body?: z.ZodType<B>;
  /** 'user' (the default): 401 without a session. 'optional': the handler sees null. 'public': no lookup. */
  auth?: A;
  /** Status of a successful answer (default 200; 201 for creations). */
  status?: number;
}

/** A route acting on a group or a derivation: the action is checked against the user's role there. */
export interface AccessSpec<P, Q, B> extends Omit<RouteSpec<P, Q, B, 'user'>, 'auth' | 'params'> {
  params: z.ZodType<P>;
  action: Action;
}

export interface RouteInput<P, Q, B, U> {
  req: NextRequest;
  params: P;
  query: Q;
  body: B;
  user: U;
}

interface RouteContext {
  params: Promise<unknown>;
}

export type RouteHandler = (req: NextRequest, context: RouteContext) => Promise<Response>;

function json(status: number, payload: unknown): Response {
  return Response.json(payload, { status, headers: { 'cache-control': 'no-store' } });
}

function errorResponse(status: number, error: string, field?: string): Response {
  return json(status, field ? { error, field } : { error });
}

function fieldOf(issue: z.core.$ZodIssue | undefined): string | undefined {
  if (!issue || issue.path.length === 0) return undefined;
  return issue.path.map(String).join('.');
}

function validationError(error: z.ZodError, where: string): ApiError {
  const issue = error.issues[0];
  const field = fieldOf(issue);
  const message = issue?.message ?? `Invalid ${where}.`;
  return new ApiError(400, message, field);
}

const MUTATING = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/** A request from another site's page is refused: the Origin, when sent, must be ours. */
function checkOrigin(req: NextRequest): void {
  if (!MUTATING.has(req.method)) return;
  const origin = req.headers.get('origin');
  if (!origin) return;
  const expected = process.env.NEXTAUTH_URL ? new URL(process.env.NEXTAUTH_URL).host : req.headers.get('host');
  let host: string;
  try {
    host = new URL(origin).host;
  } catch {
    throw new ApiError(403, 'This request came from another site and was refused.');
  }
  if (host !== expected) throw new ApiError(403, 'This request came from another site and was refused.');
}

async function readBody(req: NextRequest): Promise<unknown> {
  const type = req.headers.get('content-type') ?? '';
  const text = await req.text();
  if (text.length === 0) return undefined;
  if (!type.toLowerCase().startsWith('application/json')) {
    throw new ApiError(400, 'Send the request body as JSON (Content-Type: application/json).');
  }
  if (text.length > MAX_BODY_BYTES) throw new ApiError(400, 'The request body is too large.');
  try {
    return JSON.parse(text) as unknown;
  } catch {
    throw new ApiError(400, 'The request body is not valid JSON.');
  }
}

function cookiesOf(req: NextRequest): Record<string, string> {
  return Object.fromEntries(req.cookies.getAll().map((c) => [c.name, c.value]));
}

/** Postgres unique violation: two writers raced for the same name or row. */
function isUniqueViolation(error: unknown): boolean {
  return typeof error === 'object' && error !== null && (error as { code?: unknown }).code === '23505';
}

type Resolve<P, Access> = (user: SessionUser | null, params: P) => Promise<Access>;

function wrap<P, Q, B, U, Access>(
  spec: RouteSpec<P, Q, B, Auth>,
  resolveAccess: Resolve<P, Access>,
  handler: (input: RouteInput<P, Q, B, U> & { access: Access }) => Promise<unknown>,
): RouteHandler {
  return async (req, context) => {
    try {
      checkOrigin(req);
      const auth: Auth = spec.auth ?? 'user';
      const user = auth === 'public' ? null : await sessionUserFromCookies(cookiesOf(req));
      if (auth === 'user' && !user) throw new ApiError(401, 'Sign in first.');

      // An id that cannot exist is simply not found.
      let params = {} as P;
      if (spec.params) {
        const parsed = spec.params.safeParse(await context.params);
        if (!parsed.success) throw new ApiError(404, 'Not found.');
        params = parsed.data;
      }

      const access = await resolveAccess(user, params);

      let query = {} as Q;
      if (spec.query) {
        const parsed = spec.query.safeParse(Object.fromEntries(req.nextUrl.searchParams));
        if (!parsed.success) throw validationError(parsed.error, 'query');
        query = parsed.data;
      }

      let body = undefined as B;
      if (spec.body) {
        const raw = await readBody(req);
        const parsed = spec.body.safeParse(raw ?? {});
        if (!parsed.success) throw validationError(parsed.error, 'body');
        body = parsed.data;
      }

      const result = await handler({ req, params, query, body, user: user as U, access });
      if (result instanceof Response) return result;
      if (result === undefined) return new Response(null, { status: 204 });
      return json(spec.status ?? 200, result);
    } catch (error) {
      if (error instanceof ApiError) return errorResponse(error.status, error.message, error.field);
      if (error instanceof AccessError) return errorResponse(error.status, error.message);
      if (isUniqueViolation(error)) return errorResponse(409, 'That already exists.');
      console.error(`${req.method} ${req.nextUrl.pathname} failed:`, error);
      return errorResponse(500, 'Something went wrong on the server.');
    }
  };
}

const noAccess = async (): Promise<null> => null;

function signedIn(user: SessionUser | null): SessionUser {
  if (!user) throw new ApiError(401, 'Sign in first.');
  return user;
}

/** A route that needs no group role: public, optionally signed in, or signed in (the default). */
export function route<P = Record<string, never>, Q = Record<string, never>, B = undefined, A extends Auth = 'user'>(
  spec: RouteSpec<P, Q, B, A>,
  handler: (input: RouteInput<P, Q, B, UserFor<A>>) => Promise<unknown>,
): RouteHandler {
  return wrap<P, Q, B, UserFor<A>, null>(spec, noAccess, handler);
}

/** A route on a group (URL parameter groupId): 401 without a session, 404 unknown, 403 refused. */
export function groupRoute<P extends { groupId: string }, Q = Record<string, never>, B = undefined>(
  spec: AccessSpec<P, Q, B>,
  handler: (input: RouteInput<P, Q, B, SessionUser> & { access: GroupAccess }) => Promise<unknown>,
): RouteHandler {
  return wrap<P, Q, B, SessionUser, GroupAccess>(
    spec,
    (user, params) => authorizeGroup(signedIn(user).id, params.groupId, spec.action),
    handler,
  );
}

/** A route on a derivation (URL parameter derivationId), checked through its group's membership. */
export function derivationRoute<P extends { derivationId: string }, Q = Record<string, never>, B = undefined>(
  spec: AccessSpec<P, Q, B>,
  handler: (input: RouteInput<P, Q, B, SessionUser> & { access: DerivationAccess }) => Promise<unknown>,
): RouteHandler {
  return wrap<P, Q, B, SessionUser, DerivationAccess>(
    spec,
    (user, params) => authorizeDerivation(signedIn(user).id, params.derivationId, spec.action),
    handler,
  );
}
