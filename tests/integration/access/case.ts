/** The demo's rows a route case addresses (all in the demo site). */
export type Ids = { siteId: string; houseId: string; plugId: string; sensorId: string };

/**
 * One exported method of one route handler, and how to call it. Each feature lists its
 * handlers in a file of this folder; access.test.ts runs the checks over all of them.
 */
export type RouteCase = {
  file: string;
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  handler: unknown;
  path: (ids: Ids) => string;
  params: (ids: Ids) => Record<string, string>;
  body?: unknown;
  /** Site-scoped handlers must hide other sites. */
  siteScoped: boolean;
  /** Writes are refused to a viewer (403) and change nothing. */
  write: boolean;
};
