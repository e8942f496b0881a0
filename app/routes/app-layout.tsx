import { data, Outlet } from "react-router";
import { AppShell } from "~/components/app-shell";
import { listMemberships } from "~/auth/membership.server";
import { getCurrentSession, requireUser } from "~/auth/session.server";
import { outboxEnabled } from "~/env.server";
import type { Route } from "./+types/app-layout";

/** Every signed-in page: the user, their organisations and the current one. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const user = await requireUser(request);
  const session = await getCurrentSession(request);
  const organizations = await listMemberships(user.id);
  const current =
    organizations.find((org) => org.id === params.orgId) ??
    (params.orgId ? null : (organizations[0] ?? null));
  return data(
    {
      user: { name: user.name, email: user.email },
      organizations,
      current,
      outbox: outboxEnabled(),
    },
    session?.refreshCookie
      ? { headers: { "Set-Cookie": session.refreshCookie } }
      : undefined,
  );
}

export default function AppLayout({ loaderData }: Route.ComponentProps) {
  return (
    <AppShell {...loaderData}>
      <Outlet />
    </AppShell>
  );
}
