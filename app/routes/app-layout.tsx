import { Outlet } from "react-router";
import { AppShell } from "~/components/app-shell";
import {
  signedInMiddleware,
  signedInPrincipal,
} from "~/auth/page-access.server";
import { outboxEnabled } from "~/env.server";
import type { Route } from "./+types/app-layout";

/** Signed in, or off to sign in; resolved once for the whole request. */
export const middleware: Route.MiddlewareFunction[] = [signedInMiddleware];

/** Every signed-in page: the user, their organisations and the current one. */
export async function loader({ params, context }: Route.LoaderArgs) {
  const principal = signedInPrincipal(context);
  const { user } = principal;
  const organizations = await principal.memberships();
  const current =
    organizations.find((org) => org.id === params.orgId) ??
    (params.orgId ? null : (organizations[0] ?? null));
  return {
    user: { name: user.name, email: user.email },
    organizations,
    current,
    outbox: outboxEnabled(),
  };
}

export default function AppLayout({ loaderData }: Route.ComponentProps) {
  return (
    <AppShell {...loaderData}>
      <Outlet />
    </AppShell>
  );
}
