import { data, Link } from "react-router";
import { z } from "zod";
import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { Cautions } from "~/components/cautions";
import { PlantCard } from "~/components/plant/plant-card";
import { PlantForm } from "~/components/plant/plant-form";
import { PlantMethodNote } from "~/components/plant/plant-method-note";
import { SectionCard } from "~/components/section-card";
import { EmptyState, PageHeader } from "~/components/ui";
import { idField } from "~/lib/ids";
import { parseForm } from "~/lib/forms";
import { sitePlantMonths } from "~/plant/plant-months.server";
import { plantFormSchema } from "~/plant/plant-schema";
import {
  archivePlant,
  createPlant,
  listPlants,
  PlantRuleError,
} from "~/plant/plants.server";
import { listSiteMeters } from "~/sites/meters.server";
import { DuplicateNameError, getSite } from "~/sites/sites.server";
import type { Route } from "./+types/site-plant";

export const meta: Route.MetaFunction = ({ loaderData }) => [
  { title: `Plant · ${loaderData?.site.name ?? "Site"} · Joulebook` },
];

export async function loader({ params, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context);
  const site = await getSite({
    organizationId: organization.id,
    siteId: idParam(params.siteId, "No such site."),
  });
  if (!site) notFound("No such site.");
  const scope = { organizationId: organization.id, siteId: site.id };
  const [plants, meters] = await Promise.all([
    listPlants(scope),
    listSiteMeters(scope),
  ]);
  const months = await sitePlantMonths({ ...scope, plants });
  return {
    organization,
    site,
    plants: plants.map((p) => ({ ...p, months: months.get(p.id) ?? [] })),
    meters: meters
      .filter((m) => m.removedAt === null)
      .map((m) => ({
        id: m.id,
        code: m.code,
        name: m.name,
        carrier: m.carrier,
      })),
    canManage: can(role, "sites.manage"),
  };
}

const archiveSchema = z.strictObject({
  intent: z.literal("archive-plant"),
  plantId: idField("No such plant."),
});

type Result = {
  intent: string;
  errors: Record<string, string>;
  message?: string;
};
const fail = (intent: string, errors: Record<string, string>, status = 400) =>
  data<Result>({ intent, errors }, { status });

export async function action({ request, params, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "sites.manage");
  const site = await getSite({
    organizationId: organization.id,
    siteId: idParam(params.siteId, "No such site."),
  });
  if (!site) notFound("No such site.");
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  const scope = {
    organizationId: organization.id,
    actorUserId: user.id,
    siteId: site.id,
  };
  if (intent === "archive-plant") {
    const form = parseForm(formData, archiveSchema);
    if (!form.ok) return fail(intent, form.errors);
    const archived = await archivePlant({
      ...scope,
      plantId: form.data.plantId,
    });
    if (!archived) notFound("No such plant.");
    return data<Result>({ intent, errors: {}, message: "Plant archived." });
  }
  const form = parseForm(formData, plantFormSchema);
  if (!form.ok) return fail("add-plant", form.errors);
  try {
    await createPlant({ ...scope, form: form.data });
    return data<Result>({ intent, errors: {}, message: "Plant added." });
  } catch (error) {
    if (error instanceof PlantRuleError)
      return fail(intent, { [error.field]: error.message });
    if (error instanceof DuplicateNameError)
      return fail(intent, { name: error.message }, 409);
    throw error;
  }
}

export default function SitePlant({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { site, plants, meters, canManage, organization } = loaderData;
  const siteLink = `/o/${organization.id}/sites/${site.id}`;
  return (
    <>
      <PageHeader
        title={`Plant at ${site.name}`}
        description="Boilers, CHP, heat pumps, chillers and fuel cells inside the site's boundary, each month checked against what the laws of energy allow."
        actions={
          <Link
            to={siteLink}
            className="font-semibold text-spruce-700 underline-offset-4 hover:underline"
          >
            Back to the site
          </Link>
        }
      />
      <div className="flex flex-col gap-6">
        {plants.length === 0 ? (
          <SectionCard headingId="plant-heading" title="Plant">
            <div className="mt-3">
              <EmptyState title="No plant on this site yet">
                {canManage
                  ? "Add a boiler, CHP, heat pump, chiller or fuel cell below, with the meters on its inputs and outputs."
                  : "An energy manager adds plant."}
              </EmptyState>
            </div>
          </SectionCard>
        ) : (
          plants.map((plant) => (
            <PlantCard
              key={plant.id}
              plant={plant}
              orgId={organization.id}
              canManage={canManage}
            />
          ))
        )}
        <PlantMethodNote />
        {canManage ? (
          <PlantForm
            meters={meters}
            errors={actionData?.intent === "add-plant" ? actionData.errors : {}}
            message={actionData?.message}
          />
        ) : null}
        <Cautions />
      </div>
    </>
  );
}
