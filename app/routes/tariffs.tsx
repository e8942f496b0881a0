import { data, useActionData } from "react-router";
import { notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { TariffVersionsGrid } from "~/components/tariffs/tariff-versions-grid";
import {
  supplyChoices,
  TariffVersionForm,
} from "~/components/tariffs/tariff-version-form";
import { EmptyState, Notice, PageHeader } from "~/components/ui";
import { parseForm } from "~/lib/forms";
import { carriers } from "~/sites/meter-kinds";
import { tariffFormSchema, versionFromForm } from "~/tariffs/tariff-form";
import {
  addTariffVersion,
  createTariff,
  listTariffs,
  untariffedSupplies,
} from "~/tariffs/tariffs.server";
import type { Route } from "./+types/tariffs";

export const meta: Route.MetaFunction = () => [
  { title: "Tariffs · Joulebook" },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "tariffs.view");
  const canManage = can(role, "tariffs.manage");
  const [tariffs, untariffed] = await Promise.all([
    listTariffs(organization.id),
    canManage ? untariffedSupplies(organization.id) : Promise.resolve([]),
  ]);
  return { tariffs, untariffed, canManage };
}

type Result = { errors: Record<string, string>; message?: string };

export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "tariffs.manage");
  const form = parseForm(await request.formData(), tariffFormSchema);
  if (!form.ok) return data<Result>({ errors: form.errors }, { status: 400 });
  const version = versionFromForm(form.data);
  if (!version.ok)
    return data<Result>({ errors: version.errors }, { status: 400 });
  const actor = { organizationId: organization.id, actorUserId: user.id };
  const [kind, id, carrier] = form.data.supply.split(":");
  let outcome;
  if (kind === "t") {
    outcome = await addTariffVersion(actor, id, version.input);
  } else {
    if (!(carriers as readonly string[]).includes(carrier))
      return data<Result>(
        { errors: { supply: "Choose a supply" } },
        { status: 400 },
      );
    if (!form.data.name)
      return data<Result>(
        { errors: { name: "Name the tariff" } },
        { status: 400 },
      );
    if (!/^[A-Z]{3}$/.test(form.data.currency))
      return data<Result>(
        { errors: { currency: "Currency: three capital letters, e.g. GBP" } },
        { status: 400 },
      );
    outcome = await createTariff(actor, {
      name: form.data.name,
      site_id: id,
      carrier: carrier as (typeof carriers)[number],
      meter_id: null,
      currency: form.data.currency,
      illustrative: false,
      first_version: version.input,
    });
  }
  if (!outcome.ok) {
    if (outcome.status === 404) notFound("No such tariff.");
    const field =
      outcome.field === "valid_from"
        ? "validFrom"
        : outcome.field === "site_id"
          ? "supply"
          : "form";
    return data<Result>(
      { errors: { [field]: outcome.reason } },
      { status: 400 },
    );
  }
  return data<Result>({
    errors: {},
    message: `Saved: ${outcome.tariff.name}, its months priced again.`,
  });
}

export default function Tariffs({ loaderData }: Route.ComponentProps) {
  const { tariffs, untariffed, canManage } = loaderData;
  const result = useActionData<typeof action>();
  const illustrative = tariffs.some((t) => t.illustrative);
  return (
    <>
      <PageHeader
        title="Tariffs"
        description="What each supply pays: unit rates by time of day, standing and capacity charges, the maximum-demand charge, levies and VAT. The Ledger prices every interval with the version in force on its local day."
      />
      {illustrative ? (
        <Notice>
          The demo&apos;s tariffs are illustrative: invented figures, not any
          supplier&apos;s prices.
        </Notice>
      ) : null}
      {result?.message ? (
        <Notice tone="success">{result.message}</Notice>
      ) : null}
      <section className="mt-4" aria-label="Tariff versions">
        {tariffs.length === 0 ? (
          <EmptyState title="No tariffs yet">
            Without a tariff, the Ledger shows energy without its cost.
          </EmptyState>
        ) : (
          <TariffVersionsGrid tariffs={tariffs} />
        )}
      </section>
      {canManage ? (
        <div className="mt-6">
          <TariffVersionForm
            choices={supplyChoices(tariffs, untariffed)}
            errors={result?.errors ?? {}}
          />
        </div>
      ) : null}
    </>
  );
}
