import { data, Form, redirect } from "react-router";
import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { MeterFields } from "~/components/meter-fields";
import { Button, Card, Notice, PageHeader } from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { meterFormSchema } from "~/sites/meter-schema";
import {
  createMeter,
  listSiteMeters,
  MeterRuleError,
  ResolutionFixedError,
} from "~/sites/meters.server";
import { DuplicateNameError, getSite } from "~/sites/sites.server";
import type { Route } from "./+types/meter-new";

export const meta: Route.MetaFunction = () => [
  { title: "Add a meter · Joulebook" },
];

export async function loader({ params, context }: Route.LoaderArgs) {
  const { organization } = requirePermission(context, "sites.manage");
  const site = await getSite({
    organizationId: organization.id,
    siteId: idParam(params.siteId, "No such site."),
  });
  if (!site) notFound("No such site.");
  const parents = (
    await listSiteMeters({ organizationId: organization.id, siteId: site.id })
  ).filter((m) => !m.removedAt);
  return { site, parents };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "sites.manage");
  const site = await getSite({
    organizationId: organization.id,
    siteId: idParam(params.siteId, "No such site."),
  });
  if (!site) notFound("No such site.");
  const form = parseForm(await request.formData(), meterFormSchema);
  if (!form.ok) return data({ errors: form.errors }, { status: 400 });
  const { intent: _intent, ...input } = form.data;
  try {
    await createMeter({
      organizationId: organization.id,
      actorUserId: user.id,
      siteId: site.id,
      input,
    });
  } catch (error) {
    if (error instanceof DuplicateNameError)
      return data(
        { errors: { code: error.message } as Record<string, string> },
        { status: 409 },
      );
    if (error instanceof ResolutionFixedError)
      return data(
        {
          errors: { intervalMinutes: error.message } as Record<string, string>,
        },
        { status: 409 },
      );
    if (error instanceof MeterRuleError)
      return data(
        { errors: { parentMeterId: error.message } as Record<string, string> },
        { status: 400 },
      );
    throw error;
  }
  throw redirect(`/o/${organization.id}/sites/${site.id}`);
}

export default function MeterNew({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const errors: Record<string, string | undefined> = actionData?.errors ?? {};
  return (
    <>
      <PageHeader
        title="Add a meter"
        description={`On the boundary of ${loaderData.site.name}.`}
      />
      <Card>
        <Form method="post" className="flex flex-col gap-4" noValidate>
          {errors.form ? <Notice tone="error">{errors.form}</Notice> : null}
          <MeterFields errors={errors} parents={loaderData.parents} />
          <div>
            <Button type="submit">Add meter</Button>
          </div>
        </Form>
      </Card>
    </>
  );
}
