// Small pieces every account and library route shares: a typed error that domain modules throw, a wrapper that
// turns it (and anything unexpected) into the one error shape of http.ts, and guards for the signed-in user.
import type { APIContext } from "astro";
import type { z } from "zod";
import { error, fieldErrors, type FieldErrors } from "./http";
import type { SessionUser } from "./session";

/** A refusal with an HTTP status, thrown by lib/server modules and answered by `route`. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fields?: FieldErrors,
    readonly extra?: Record<string, unknown>,
    readonly headers: Record<string, string> = {},
  ) {
    super(message);
    this.name = "ApiError";
  }
}

/** The answer for an ApiError: the one error shape, plus any extra top-level members (e.g. `latest` on a 409). */
export function errorResponse(e: ApiError): Response {
  const response = error(e.status, e.code, e.message, e.fields, e.headers);
  if (!e.extra) return response;
  const body = { error: { code: e.code, message: e.message, ...(e.fields ? { fields: e.fields } : {}) }, ...e.extra };
  return new Response(JSON.stringify(body), { status: e.status, headers: response.headers });
}

/**
 * Wraps an endpoint: ApiErrors become their response, anything else a logged 500 in the error shape.
 * @example export const GET = route(async (ctx) => json(await listGrooves(ctx.locals.user, ...)));
 */
export function route(handler: (ctx: APIContext) => Promise<Response>): (ctx: APIContext) => Promise<Response> {
  return (ctx) => answerErrors(() => handler(ctx), { what: `${ctx.request.method} ${ctx.url.pathname}`, aborted: () => ctx.request.signal?.aborted === true });
}

/**
 * Runs a handler the way every route does (route() and the fast lanes): ApiErrors become their response, anything
 * else a logged 500 in the error shape (or 499 with nothing logged when the client already hung up).
 */
export async function answerErrors(run: () => Promise<Response>, opts: { what: string; aborted: () => boolean }): Promise<Response> {
  try {
    return await run();
  } catch (e) {
    if (e instanceof ApiError) return errorResponse(e);
    // The client hung up mid-request (its body stream was cut): nobody is left to answer, nothing to log.
    if (opts.aborted()) return new Response(null, { status: 499 });
    console.error(`${opts.what} failed:`, e);
    return error(500, "internal_error", "Something went wrong on the server; nothing was changed by this request.");
  }
}

/** The signed-in user, or a 401. */
export function requireUser(ctx: Pick<APIContext, "locals">): SessionUser {
  const user = ctx.locals.user;
  if (!user) throw new ApiError(401, "unauthenticated", "Sign in first.");
  return user;
}

/** A signed-in site administrator, or 401/403. */
export function requireAdmin(ctx: Pick<APIContext, "locals">): SessionUser {
  const user = requireUser(ctx);
  if (user.siteRole !== "admin") throw new ApiError(403, "forbidden", "Only site administrators may do this.");
  return user;
}

/** A 429 with the wait in seconds, in the body and in Retry-After. */
export function tooManyRequests(retryAfterSeconds: number, what = "Too many attempts"): ApiError {
  return new ApiError(
    429,
    "rate_limited",
    `${what}: try again in ${retryAfterSeconds} second${retryAfterSeconds === 1 ? "" : "s"}.`,
    undefined,
    { retryAfterSeconds },
    { "retry-after": String(retryAfterSeconds) },
  );
}

/** The client's address as the Node adapter sees it. */
export function clientAddress(ctx: Pick<APIContext, "clientAddress">): string {
  try {
    return ctx.clientAddress || "unknown";
  } catch {
    return "unknown";
  }
}

/**
 * Validates the query string with a zod schema (repeated keys: the last wins); 400 with fields when invalid.
 * @example const q = parseQuery(ctx.url, z.object({ page: z.coerce.number().int().min(1).default(1) }));
 */
export function parseQuery<S extends z.ZodType>(url: URL, schema: S): z.output<S> {
  const raw: Record<string, string> = {};
  for (const [key, value] of url.searchParams) raw[key] = value;
  const result = schema.safeParse(raw);
  if (!result.success) throw new ApiError(400, "invalid_query", "Some query parameters are not valid.", fieldErrors(result.error.issues));
  return result.data;
}

/** A route parameter that must look like an id; anything else is a 404 without touching the database. */
export function idParam(ctx: Pick<APIContext, "params">, name: string, what = "groove"): string {
  const value = ctx.params[name];
  if (!value || !/^[A-Za-z0-9_-]{1,64}$/.test(value)) throw new ApiError(404, "not_found", `No ${what} has this id.`);
  return value;
}

/** Empty success (204). */
export const noContent = () => new Response(null, { status: 204, headers: { "cache-control": "no-store" } });

/**
 * The address links in e-mails start with: TACTUS_PUBLIC_URL when set (a deployment must set it, or configure Astro's
 * security.allowedDomains); else the Host the request came to when it is a loopback address (local use: a forged Host
 * cannot point a link anywhere but the reader's own machine); else the origin Astro validated.
 */
export function siteOrigin(ctx: Pick<APIContext, "url" | "request">): string {
  if (process.env.TACTUS_PUBLIC_URL) return process.env.TACTUS_PUBLIC_URL.replace(/\/+$/, "");
  const host = ctx.request.headers.get("host") ?? "";
  if (/^(127\.\d{1,3}\.\d{1,3}\.\d{1,3}|localhost|\[::1\])(:\d{1,5})?$/.test(host)) return `${ctx.url.protocol}//${host}`;
  return ctx.url.origin;
}
