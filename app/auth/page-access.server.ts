/**
 * How pages learn who is asking. Middleware resolves the request once
 * (request-principal.server.ts) and keeps the answer in React Router's
 * `context`; loaders and actions read it from there:
 *
 *   - app-layout.tsx runs `signedInMiddleware`: the signed-in person, or a
 *     redirect to sign-in that comes back to the page;
 *   - org-layout.tsx runs `memberMiddleware`: the person's membership of
 *     `:orgId`, or 404 (not a member looks like no such organisation);
 *   - a loader or action under /o/:orgId starts with
 *     `requirePermission(context, "ledger.view")`: 403 for a role without it.
 */
import {
  createContext,
  redirect,
  type MiddlewareFunction,
  type RouterContextProvider,
} from "react-router";
import { forbidden, notFound } from "./membership.server";
import { can, type Permission } from "./permissions";
import {
  RequestPrincipal,
  type OrganizationContext,
} from "./request-principal.server";
import type { SignedInUser } from "./session.server";

// No defaults: reading one outside its layout is a mistake, and throws.
const principalContext = createContext<RequestPrincipal>();
const membershipContext = createContext<OrganizationContext>();

type Context = Readonly<RouterContextProvider>;

/** Sign in first, then come back to this page (path and query). */
function signInRedirect(url: URL): Response {
  const redirectTo = `${url.pathname}${url.search}`;
  return redirect(`/sign-in?redirectTo=${encodeURIComponent(redirectTo)}`);
}

/**
 * Every signed-in page (app-layout.tsx): resolves the person once, and sends
 * the session cookie back when lucia extended the session.
 */
export const signedInMiddleware: MiddlewareFunction<Response> = async (
  { request, url, context },
  next,
) => {
  const principal = await RequestPrincipal.resolve(request);
  // `url` is the page's, without a data request's `.data` suffix.
  if (!principal) throw signInRedirect(url);
  context.set(principalContext, principal);
  const response = await next();
  if (principal.refreshCookie) {
    response.headers.append("Set-Cookie", principal.refreshCookie);
  }
  return response;
};

/** Everything under /o/:orgId (org-layout.tsx): members only, others get 404. */
export const memberMiddleware: MiddlewareFunction<Response> = async ({
  params,
  context,
}) => {
  const membership = await context
    .get(principalContext)
    .membershipOf(params.orgId);
  if (!membership) notFound("No such organisation.");
  context.set(membershipContext, membership);
};

/** The request's signed-in person (pages under app-layout.tsx). */
export function signedInPrincipal(context: Context): RequestPrincipal {
  return context.get(principalContext);
}

/** The request's signed-in user (pages under app-layout.tsx). */
export function signedInUser(context: Context): SignedInUser {
  return context.get(principalContext).user;
}

/**
 * The person's organisation and role on a page under /o/:orgId, checked for
 * a permission: a role without it answers 403.
 */
export function requirePermission(
  context: Context,
  permission: Permission = "organization.view",
): OrganizationContext {
  const membership = context.get(membershipContext);
  if (!can(membership.role, permission)) forbidden();
  return membership;
}
