import { Outlet } from "react-router";
import { requireMembership } from "~/auth/membership.server";
import type { Route } from "./+types/org-layout";

/** Guards everything under /o/:orgId: members only, others get 404. */
export async function loader({ request, params }: Route.LoaderArgs) {
  const { organization, role } = await requireMembership(request, params.orgId);
  return { organization, role };
}

export default function OrganizationLayout() {
  return <Outlet />;
}
