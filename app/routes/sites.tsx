import { data, Form, Link, redirect } from "react-router";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { SiteFields } from "~/components/site-fields";
import { Button, Card, EmptyState, Notice, PageHeader } from "~/components/ui";
import { siteCreationRefusal } from "~/billing/site-gate.server";
import { formatArea } from "~/lib/format";
import { parseForm } from "~/lib/forms";
import { siteFormSchema } from "~/sites/site-schema";
import {
  createSite,
  DuplicateNameError,
  listSites,
} from "~/sites/sites.server";
import type { Route } from "./+types/sites";

export const meta: Route.MetaFunction = () => [{ title: "Sites · Joulebook" }];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context);
  const canManage = can(role, "sites.manage");
  return {
    organization,
    sites: await listSites({ organizationId: organization.id }),
    canManage,
    billingRefusal: canManage
      ? await siteCreationRefusal(organization.id)
      : null,
  };
}

export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "sites.manage");
  // Unpaid past the grace period: the estate may not grow (ingest goes on).
  const refusal = await siteCreationRefusal(organization.id);
  if (refusal)
    return data(
      { errors: { form: refusal } as Record<string, string> },
      { status: 402 },
    );
  const form = parseForm(await request.formData(), siteFormSchema);
  if (!form.ok) return data({ errors: form.errors }, { status: 400 });
  const { intent: _intent, ...input } = form.data;
  try {
    const siteId = await createSite({
      organizationId: organization.id,
      actorUserId: user.id,
      input,
    });
    throw redirect(`/o/${organization.id}/sites/${siteId}`);
  } catch (error) {
    if (error instanceof DuplicateNameError)
      return data(
        { errors: { name: error.message } as Record<string, string> },
        { status: 409 },
      );
    throw error;
  }
}

export default function Sites({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { sites, canManage, organization, billingRefusal } = loaderData;
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  return (
    <>
      <PageHeader
        title="Sites"
        description="Each site is a boundary: its meters measure the heat and work that cross it."
      />
      <div className="flex flex-col gap-6">
        {sites.length === 0 ? (
          <EmptyState title="No sites yet">
            {canManage
              ? "Add the first site below."
              : "An energy manager adds sites."}
          </EmptyState>
        ) : (
          <ul className="grid gap-4 sm:grid-cols-2 xl:grid-cols-3">
            {sites.map((site) => (
              <li key={site.id}>
                <Link
                  to={`/o/${organization.id}/sites/${site.id}`}
                  className="block h-full rounded-card border border-line bg-surface p-5 shadow-card hover:border-spruce-600"
                >
                  <p className="text-lg font-semibold">{site.name}</p>
                  <p className="text-sm text-ink-muted">
                    {site.address || "No address"}
                  </p>
                  <p className="mt-3 text-sm">
                    {site.meterCount} meter{site.meterCount === 1 ? "" : "s"}
                    {site.floorAreaM2
                      ? ` · ${formatArea(Number(site.floorAreaM2))}`
                      : ""}
                  </p>
                </Link>
              </li>
            ))}
          </ul>
        )}
        {canManage && billingRefusal ? (
          <Notice tone="caution" title="Adding sites is paused">
            {billingRefusal}
          </Notice>
        ) : null}
        {canManage && !billingRefusal ? (
          <Card aria-labelledby="new-site-heading">
            <h2 id="new-site-heading" className="text-lg">
              Add a site
            </h2>
            <Form method="post" className="mt-4 flex flex-col gap-4" noValidate>
              {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
              <SiteFields errors={errors} />
              <div>
                <Button type="submit">Add site</Button>
              </div>
            </Form>
          </Card>
        ) : null}
      </div>
    </>
  );
}
