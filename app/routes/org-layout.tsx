import { Outlet } from "react-router";
import { memberMiddleware, requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { standingOf } from "~/billing/account.server";
import { BillingBanner } from "~/components/billing-banner";
import type { Route } from "./+types/org-layout";

/** Guards everything under /o/:orgId: members only, others get 404. */
export const middleware: Route.MiddlewareFunction[] = [memberMiddleware];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context);
  // Billing trouble is news for the people who pay; from the database only.
  const standing = can(role, "billing.view")
    ? await standingOf(organization.id)
    : null;
  const billing = standing?.needsAttention
    ? {
        kind: standing.kind,
        graceEndsAt: standing.graceEndsAt,
        sitesBlocked: standing.sitesBlocked,
      }
    : null;
  return { organization, role, billing };
}

export default function OrganizationLayout({
  loaderData,
}: Route.ComponentProps) {
  return (
    <>
      <BillingBanner
        billing={loaderData.billing}
        organizationId={loaderData.organization.id}
      />
      <Outlet />
    </>
  );
}
