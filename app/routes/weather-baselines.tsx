import { data } from "react-router";
import { z } from "zod";
import { saveBaseline } from "~/baselines/baselines.server";
import { periodErrors } from "~/baselines/periods";
import { MAX_WEATHER_BYTES } from "~/baselines/weather-csv";
import { weatherPageView } from "~/baselines/weather-page.server";
import {
  UPLOAD_TOO_LARGE,
  uploadWeather,
} from "~/baselines/weather-upload.server";
import { notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { Cautions } from "~/components/cautions";
import { EmptyState, Notice, PageHeader } from "~/components/ui";
import {
  BaselineModelCard,
  type SaveBaselineResult,
} from "~/components/weather/baseline-model";
import { DegreeDaysByMonth } from "~/components/weather/degree-days-by-month";
import { EnergyAgainstDegreeDays } from "~/components/weather/energy-against-degree-days";
import { EnpiCard } from "~/components/weather/enpi-card";
import { SavedBaselines } from "~/components/weather/saved-baselines";
import { SavingsCard } from "~/components/weather/savings-card";
import { WeatherControls } from "~/components/weather/weather-controls";
import { formatCount, monthShort } from "~/lib/format";
import { WeatherUploadCard } from "~/components/weather/weather-upload";
import type { WeatherUploadResult } from "~/baselines/weather-csv";
import { FormTooLarge, readBoundedForm } from "~/lib/bounded-form.server";
import { parseForm } from "~/lib/forms";
import { idField, isUuid } from "~/lib/ids";
import { MONTH_PATTERN } from "~/lib/months";
import { carrierLabels, carriers } from "~/sites/meter-kinds";
import { getSite, listSites } from "~/sites/sites.server";
import type { Route } from "./+types/weather-baselines";

export const meta: Route.MetaFunction = () => [
  { title: "Weather & baselines · Joulebook" },
];

/** A site of this organisation, or 404: ids of other organisations reveal nothing. */
async function siteOr404(organizationId: string, siteId: string) {
  const site = isUuid(siteId)
    ? await getSite({ organizationId, siteId })
    : null;
  if (!site) notFound("No such site.");
  return site;
}

export async function loader({ request, context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "ledger.view");
  const sites = await listSites({ organizationId: organization.id });
  const base = {
    organization,
    canManage: can(role, "sites.manage"),
    sites: sites.map((s) => ({ id: s.id, name: s.name })),
  };
  const query = new URL(request.url).searchParams;
  const siteParam = query.get("site");
  if (!siteParam && sites.length === 0)
    return { ...base, view: null, savedList: [], coverage: null };
  const site = await siteOr404(organization.id, siteParam ?? sites[0].id);
  const page = await weatherPageView({
    organizationId: organization.id,
    site,
    query,
  });
  return { ...base, ...page };
}

const saveSchema = z.strictObject({
  intent: z.literal("save-baseline"),
  siteId: idField("Choose a site."),
  carrier: z.enum(carriers, { error: "Choose a carrier." }),
  driver: z.enum(["hdd", "cdd"], { error: "Choose degree days." }),
  from: z.string().regex(MONTH_PATTERN, "Choose a month, like 2025-01."),
  to: z.string().regex(MONTH_PATTERN, "Choose a month, like 2025-12."),
});

type ActionResult = SaveBaselineResult | WeatherUploadResult;

/** Room for the form fields and multipart framing around the file itself. */
const BODY_LIMIT = MAX_WEATHER_BYTES + 64 * 1024;
/** Beyond this a body is cut off rather than read to its end and dropped. */
const DRAIN_LIMIT = 16 * 1024 * 1024;

export async function action({ request, context }: Route.ActionArgs) {
  // Both actions change the organisation's data: managers and owners only,
  // checked before the body is read.
  const { organization, user } = requirePermission(context, "sites.manage");
  let formData: FormData;
  try {
    formData = await readBoundedForm(request, {
      limit: BODY_LIMIT,
      drainLimit: DRAIN_LIMIT,
    });
  } catch (error) {
    if (error instanceof FormTooLarge)
      return data<ActionResult>(
        { intent: "upload-weather", errors: { file: UPLOAD_TOO_LARGE } },
        { status: 413 },
      );
    return data<ActionResult>(
      {
        intent: "upload-weather",
        errors: { form: "The form could not be read." },
      },
      { status: 400 },
    );
  }
  const intent = formData.get("intent");
  if (intent === "upload-weather") {
    const { status, result } = await uploadWeather({
      formData,
      organizationId: organization.id,
      actorUserId: user.id,
      siteOf: (siteId) => siteOr404(organization.id, siteId),
    });
    return data<ActionResult>(result, { status });
  }

  const form = parseForm(formData, saveSchema);
  if (!form.ok) {
    const { intent: unknown, ...errors } = form.errors;
    if (unknown) errors.form ??= "Unknown action.";
    return data<ActionResult>(
      { intent: "save-baseline", errors },
      { status: 400 },
    );
  }
  const { from, to } = form.data;
  const periodProblems = periodErrors(from, to, ["from", "to"]);
  if (Object.keys(periodProblems).length > 0)
    return data<ActionResult>(
      { intent: "save-baseline", errors: periodProblems },
      { status: 400 },
    );
  const site = await siteOr404(organization.id, form.data.siteId);
  const saved = await saveBaseline({
    organizationId: organization.id,
    actorUserId: user.id,
    site,
    carrier: form.data.carrier,
    driver: form.data.driver,
    from,
    to,
  });
  if (!saved.ok)
    return data<ActionResult>(
      { intent: "save-baseline", errors: { form: saved.reason } },
      { status: 409 },
    );
  return data<ActionResult>({
    intent: "save-baseline",
    errors: {},
    message: `Baseline saved for ${site.name}, ${carrierLabels[form.data.carrier].toLowerCase()}, ${monthShort(from)} to ${monthShort(to)}. Savings can now be reckoned against it, whatever changes later.`,
  });
}

export default function WeatherBaselines({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { view, sites, canManage, coverage, savedList } = loaderData;
  const result = actionData as ActionResult | undefined;
  const analysis = view?.analysis ?? null;
  return (
    <>
      <PageHeader
        title="Weather & baselines"
        description="Degree days from each site's daily mean outdoor temperature, energy baselines fitted on them, and the energy avoided against a baseline in the weather that came."
      />
      <div className="flex flex-col gap-6">
        {!view ? (
          <EmptyState title="No sites yet">
            Weather and baselines belong to a site: add one under Sites.
          </EmptyState>
        ) : (
          <>
            <WeatherControls view={view} sites={sites} />
            {coverage && coverage.days === 0 ? (
              <Notice tone="caution" title="No weather for this site">
                Degree days need the site's daily mean temperatures.{" "}
                {canManage
                  ? "Upload them below."
                  : "An energy manager or owner can upload them."}
              </Notice>
            ) : coverage ? (
              <p className="text-sm text-ink-muted">
                Weather for {formatCount(coverage.days)} days, from{" "}
                {coverage.first} to {coverage.last}.
              </p>
            ) : null}
            {!view.carrier ? (
              <EmptyState title="No import meters on this site's boundary">
                Baselines are fitted on the energy delivered to a site.
              </EmptyState>
            ) : null}
            {analysis ? (
              <>
                <DegreeDaysByMonth carrier={view.carrier} analysis={analysis} />
                <div className="grid gap-6 xl:grid-cols-2">
                  <BaselineModelCard
                    view={view}
                    analysis={analysis}
                    canManage={canManage}
                    result={
                      result?.intent === "save-baseline" ? result : undefined
                    }
                  />
                  <EnergyAgainstDegreeDays
                    carrier={view.carrier}
                    analysis={analysis}
                  />
                </div>
                <SavingsCard analysis={analysis} />
                <EnpiCard analysis={analysis} view={view} />
              </>
            ) : null}
            <SavedBaselines view={view} savedList={savedList} />
            {canManage ? (
              <WeatherUploadCard
                sites={sites}
                siteId={view.site.id}
                result={
                  result?.intent === "upload-weather" ? result : undefined
                }
              />
            ) : null}
          </>
        )}
        <Cautions />
      </div>
    </>
  );
}
