// One wrapper for every route handler (Pinchpoint has no server actions): resolve the caller, check
// the permission on the server, render errors in the shape of DESIGN §4.
import type { NextRequest } from "next/server";
import { actorCan, resolveActor, scopeAllows, type Actor } from "./actor";
import type { Permission } from "./roles";
import { errorResponse, forbidden, unauthorized } from "@/lib/errors";
import { findEnvironment } from "@/lib/data/environments";
import { assertSameOrigin, isWriteMethod } from "./same-origin";

export interface HandlerContext<P> {
  req: NextRequest;
  actor: Actor;
  params: P;
}

type RouteContext<P> = { params: Promise<P> };

/** The permission a route needs; `public` routes run without a caller. */
export type RouteRule = Permission | "public";

export interface RouteOptions {
  /**
   * The route reads across environments and limits itself for a token bound to one (the
   * environment list). Other routes without an `{env}` in their path refuse bound tokens.
   */
  acrossEnvironments?: boolean;
  /**
   * Renders errors (the wrapper's own 401/403 included) for routes whose clients expect another
   * error body than the API's, such as the OTLP receiver (google.rpc.Status).
   */
  renderError?: (error: unknown, req: NextRequest) => Response;
}

/** A token bound to an environment reaches that environment's routes and nothing wider. */
async function checkTokenBinding(actor: Actor, params: unknown, options: RouteOptions): Promise<void> {
  if (actor.type !== "token" || !actor.environmentId) return;
  const env = typeof params === "object" && params !== null && "env" in params ? (params as { env: unknown }).env : undefined;
  if (typeof env === "string") {
    const environment = await findEnvironment({ slug: env });
    if (environment?.id !== actor.environmentId) throw forbidden("This token is bound to another environment");
    return;
  }
  if (!options.acrossEnvironments) throw forbidden("This token is bound to one environment and cannot read across environments");
}

function refusal(actor: Actor, permission: Permission): string {
  if (actor.type === "token" && scopeAllows(actor, permission)) {
    return `This needs the ${permission} permission, which this token's creator (${actor.creator.email}, now ${actor.creator.role}) no longer has: a token does at most what its creator may`;
  }
  return `This needs the ${permission} permission`;
}

export function withPermission<P = Record<string, never>>(
  permission: RouteRule,
  handler: (ctx: HandlerContext<P>) => Promise<Response>,
  options: RouteOptions = {},
): ((req: NextRequest, ctx: RouteContext<P>) => Promise<Response>) & { permission: RouteRule } {
  const wrapped = async (req: NextRequest, ctx: RouteContext<P>) => {
    try {
      const params = (await ctx?.params) ?? ({} as P);
      // A public read needs no caller, and must not need the database to find one (GET /api/health).
      const actor = permission === "public" && !isWriteMethod(req.method) ? null : await resolveActor(req.headers);
      // A write riding on the session cookie must come from our own pages (lib/auth/same-origin.ts).
      if (actor?.type === "user" && isWriteMethod(req.method)) assertSameOrigin(req.headers);
      if (permission !== "public") {
        if (!actor) throw unauthorized();
        if (!actorCan(actor, permission)) throw forbidden(refusal(actor, permission));
        await checkTokenBinding(actor, params, options);
      }
      return await handler({ req, actor: actor as Actor, params });
    } catch (error) {
      return options.renderError ? options.renderError(error, req) : errorResponse(error);
    }
  };
  return Object.assign(wrapped, { permission });
}
