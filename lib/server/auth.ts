import "server-only";
import { APIError, betterAuth } from "better-auth";
import { drizzleAdapter } from "better-auth/adapters/drizzle";
import { createAuthMiddleware } from "better-auth/api";
import { nextCookies } from "better-auth/next-js";
import { randomUUID } from "node:crypto";
import { getDb } from "@/db/client";
import { isDatabaseUnreachable } from "@/lib/database-errors";
import * as schema from "@/db/schema";
import { createSiteForOwner } from "@/db/queries/sites";
import { assertUsable, getInvitationByToken } from "@/db/queries/invitations";
import { AppError } from "@/lib/errors";
import { invitationToken } from "@/lib/schemas/members";
import { env, trustedOrigins } from "./env";
import { firstIssue } from "./http";
import { newSiteSchema } from "@/lib/schemas/account";

/** Site fields a sign-up may carry; API clients that leave them out get sensible defaults. */
const signUpSiteSchema = newSiteSchema.partial();

function siteFromSignUp(body: Record<string, unknown>, name: string) {
  const parsed = signUpSiteSchema.parse({ siteName: body.siteName, timeZone: body.timeZone, currency: body.currency });
  return {
    siteName: parsed.siteName ?? `${name}'s houses`.slice(0, 120),
    timeZone: parsed.timeZone ?? "UTC",
    currency: parsed.currency ?? "GBP",
  };
}

/**
 * A sign-up that carries an invitation's token makes the invited person's account
 * without a site of its own: they join the inviting site by accepting next. The token
 * must be usable and the e-mail the invited one, or nothing is created.
 */
async function checkInvitedSignUp(body: Record<string, unknown>) {
  const token = invitationToken.safeParse(body.invitationToken);
  if (!token.success) throw new APIError("BAD_REQUEST", { message: firstIssue(token.error).message, code: "BAD_INPUT" });
  const invitation = await getInvitationByToken({ token: token.data });
  try {
    assertUsable(invitation);
  } catch (error) {
    throw new APIError("BAD_REQUEST", { message: (error as AppError).message, code: "INVITATION_NOT_USABLE" });
  }
  const email = typeof body.email === "string" ? body.email.trim().toLowerCase() : "";
  if (invitation!.email !== email) {
    throw new APIError("BAD_REQUEST", { message: `email: this invitation is for ${invitation!.email}`, code: "BAD_INPUT" });
  }
}

const isInvitedSignUp = (body: Record<string, unknown>) => body.invitationToken !== undefined;

function createAuth() {
  const e = env();
  return betterAuth({
    appName: "Cloche",
    logger: {
      level: e.NODE_ENV === "test" ? "error" : "warn",
      // A database that does not answer is one line, not a stack per request.
      log(level, message, ...args) {
        if (args.some(isDatabaseUnreachable)) return console.error(`[auth] ${level}: the database did not answer (${message})`);
        console[level === "debug" ? "log" : level](`[auth] ${message}`, ...args);
      },
    },
    secret: e.BETTER_AUTH_SECRET,
    baseURL: e.BETTER_AUTH_URL,
    trustedOrigins: trustedOrigins(e),
    database: drizzleAdapter(getDb(), {
      provider: "mysql",
      schema: { user: schema.user, session: schema.session, account: schema.account, verification: schema.verification },
    }),
    emailAndPassword: { enabled: true, minPasswordLength: 10, maxPasswordLength: 128, autoSignIn: true },
    session: { expiresIn: 60 * 60 * 24 * 14, updateAge: 60 * 60 * 24 },
    advanced: { database: { generateId: () => randomUUID() } },
    rateLimit: {
      enabled: true,
      window: 60,
      max: 300,
      customRules: {
        "/sign-in/email": { window: 60, max: e.CLOCHE_SIGN_IN_LIMIT },
        "/sign-up/email": { window: 60, max: 10 },
      },
    },
    hooks: {
      // Check the optional site fields before the account is made, so a bad time
      // zone is a 400 and not a user without a site.
      before: createAuthMiddleware(async (ctx) => {
        if (ctx.path !== "/sign-up/email") return;
        const body = (ctx.body ?? {}) as Record<string, unknown>;
        if (isInvitedSignUp(body)) return checkInvitedSignUp(body);
        const parsed = signUpSiteSchema.safeParse({ siteName: body.siteName, timeZone: body.timeZone, currency: body.currency });
        if (!parsed.success) {
          throw new APIError("BAD_REQUEST", { message: firstIssue(parsed.error).message, code: "BAD_INPUT" });
        }
      }),
    },
    databaseHooks: {
      user: {
        create: {
          after: async (created, ctx) => {
            const body = (ctx?.body ?? {}) as Record<string, unknown>;
            if (isInvitedSignUp(body)) return;
            await createSiteForOwner({ userId: created.id, site: siteFromSignUp(body, created.name) });
          },
        },
      },
    },
    plugins: [nextCookies()],
  });
}

export type Auth = ReturnType<typeof createAuth>;

const holder = globalThis as unknown as { __clocheAuth?: Auth };

export function getAuth(): Auth {
  holder.__clocheAuth ??= createAuth();
  return holder.__clocheAuth;
}
