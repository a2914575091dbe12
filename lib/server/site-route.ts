import "server-only";
import type { z } from "zod";
import type { SiteWithRole } from "@/db/queries/sites";
import type { Action } from "@/lib/permissions";
import type { WakePayload } from "@/lib/mqtt/topics";
import { parseJsonBody, parseWith, route, type AnySchema } from "./http";
import { requireMemberSite, requirePermission, requireUser, type SessionUser } from "./session";
import { wakeController } from "./wake";

/** Params of a route under app/api/sites/[siteId]/…: an object schema with the site's id at least. */
type SiteParamsSchema = z.ZodObject<{ siteId: z.ZodType<string, string> }>;

type BodyOf<B> = B extends AnySchema ? z.infer<B> : undefined;
type QueryOf<Q> = Q extends AnySchema ? z.infer<Q> : undefined;

/** What a site-scoped handler is given once its request has passed every check. */
export type SiteRequest<P extends SiteParamsSchema, B, L, Q = undefined> = {
  request: Request;
  params: z.infer<P>;
  body: BodyOf<B>;
  /** The URL's query, parsed (undefined without a query schema). */
  query: QueryOf<Q>;
  user: SessionUser;
  site: SiteWithRole;
  /** What the loader returned (undefined without one). */
  loaded: L;
};

export type SiteRouteSpec<P extends SiteParamsSchema, B extends AnySchema | undefined, L, Q extends AnySchema | undefined = undefined> = {
  params: P;
  /** The JSON body's schema; without it the body is not read. */
  body?: B;
  /** The schema of the URL's query (each name once, as text); without it the query is not read. */
  query?: Q;
  /** The permission the handler needs (lib/permissions.ts). */
  action: Action;
  /** Loads the row the request is about, within the site; throws a 404 AppError when it is not there. */
  load?: (args: { site: SiteWithRole; params: z.infer<P> }) => Promise<L>;
  /**
   * Changes that affect control wake the site's controller once the handler has
   * returned, so after its transaction has committed. A function may decide per
   * request (null: no wake-up).
   */
  wakes?: WakePayload | ((done: SiteRequest<P, B, L, Q>) => WakePayload | null);
  handle: (req: SiteRequest<P, B, L, Q>) => Promise<Response>;
};

/** The route segment values Next passes: every declared param as a string. */
type SegmentParams<P extends SiteParamsSchema> = { [K in keyof z.input<P>]: string };

/**
 * A route handler for a site's data, with the checks in their one order: params, query
 * and body parsed (400/413) → session (401) → membership of the site and the loader (404)
 * → permission (403) → the handler → the controller's wake-up when declared. Another
 * site's data is a 404, the same as data that does not exist.
 */
export function siteRoute<P extends SiteParamsSchema, B extends AnySchema | undefined = undefined, L = undefined, Q extends AnySchema | undefined = undefined>(
  spec: SiteRouteSpec<P, B, L, Q>,
): (request: Request, context: { params: Promise<SegmentParams<P>> }) => Promise<Response> {
  return route<SegmentParams<P>>(async (request, rawParams) => {
    const params = parseWith(spec.params, rawParams) as z.infer<P>;
    const query = (spec.query ? parseWith(spec.query, Object.fromEntries(new URL(request.url).searchParams)) : undefined) as QueryOf<Q>;
    const body = (spec.body ? await parseJsonBody(request, spec.body) : undefined) as BodyOf<B>;
    const user = await requireUser(request.headers);
    const site = await requireMemberSite(user, params.siteId);
    const loaded = (spec.load ? await spec.load({ site, params }) : undefined) as L;
    requirePermission(site, spec.action);
    const done: SiteRequest<P, B, L, Q> = { request, params, body, query, user, site, loaded };
    const response = await spec.handle(done);
    if (spec.wakes && response.ok) {
      const payload = typeof spec.wakes === "function" ? spec.wakes(done) : spec.wakes;
      if (payload) await wakeController(site.slug, payload);
    }
    return response;
  });
}
