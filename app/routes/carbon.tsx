import { data } from "react-router";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { FactorSetsSection } from "~/components/carbon/factor-sets";
import { FinancialYearForm } from "~/components/carbon/financial-year-form";
import { PageHeader } from "~/components/ui";
import { parseFactorCsv } from "~/carbon/factor-csv";
import { factorSetInputSchema } from "~/carbon/factor-schema";
import {
  carbonIntents,
  factorSetFormFields,
  financialYearFormSchema,
  type CarbonActionResult as Result,
} from "~/carbon/carbon-page-forms";
import {
  listContracts,
  listFactorSets,
  saveFactorSets,
} from "~/carbon/emission-factors.server";
import {
  financialYearStart,
  setFinancialYearStart,
} from "~/financial-year/financial-year.server";
import { parseForm } from "~/lib/forms";
import { isStorableText } from "~/lib/storable-text";
import type { Route } from "./+types/carbon";

export const meta: Route.MetaFunction = () => [{ title: "Carbon · Joulebook" }];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "ledger.view");
  return {
    organization,
    canManage: can(role, "carbon.manage"),
    canSetYear: can(role, "organization.settings"),
    sets: await listFactorSets(organization.id),
    contracts: await listContracts(organization.id),
    financialYearStart: await financialYearStart(organization.id),
  };
}

const refused = (intent: string, errors: Record<string, string>) =>
  data<Result>({ intent, errors }, { status: 400 });

export async function action({ request, context }: Route.ActionArgs) {
  const formData = await request.formData();
  const intent = String(formData.get("intent") ?? "");
  if (!(carbonIntents as readonly string[]).includes(intent))
    return refused(intent, { form: "Unknown action." });
  if (intent === "financial-year") {
    const { organization, user } = requirePermission(
      context,
      "organization.settings",
    );
    const form = parseForm(formData, financialYearFormSchema);
    if (!form.ok) return refused(intent, form.errors);
    await setFinancialYearStart(
      organization.id,
      user.id,
      form.data.start_month,
    );
    return data<Result>({
      intent,
      errors: {},
      message: "Financial year saved.",
    });
  }
  const { organization, user } = requirePermission(context, "carbon.manage");
  const actor = { actorUserId: user.id };
  if (intent === "upload-sets") {
    const file = formData.get("file");
    if (!(file instanceof File) || file.size === 0)
      return refused(intent, { file: "Choose a CSV file." });
    const text = await file.text();
    if (!isStorableText(text))
      return refused(intent, {
        file: "The file holds characters that cannot be stored.",
      });
    const parsed = parseFactorCsv(text);
    if (!parsed.ok)
      return data<Result>(
        {
          intent,
          errors: {
            file: parsed.file ?? "Some rows are not valid; nothing was stored.",
          },
          problems: parsed.problems,
        },
        { status: 400 },
      );
    const saved = await saveFactorSets(organization.id, actor, parsed.sets);
    return data<Result>({
      intent,
      errors: {},
      message: savedMessage(saved.sets.length, saved.adjusted),
    });
  }
  const fields = Object.fromEntries(
    factorSetFormFields.map((f) => [f, String(formData.get(f) ?? "")]),
  );
  const parsed = factorSetInputSchema.safeParse(fields);
  if (!parsed.success) {
    const errors: Record<string, string> = {};
    for (const issue of parsed.error.issues)
      errors[String(issue.path[0] ?? "form")] ??= issue.message;
    return refused(intent, errors);
  }
  const saved = await saveFactorSets(organization.id, actor, [parsed.data]);
  return data<Result>({
    intent,
    errors: {},
    message: savedMessage(1, saved.adjusted),
  });
}

function savedMessage(sets: number, adjusted: number): string {
  const stored = `${sets} factor ${sets === 1 ? "set" : "sets"} saved.`;
  return adjusted
    ? `${stored} ${adjusted} closed meter-${adjusted === 1 ? "month" : "months"} got an adjusting entry.`
    : stored;
}

export default function CarbonPage({
  loaderData,
  actionData,
}: Route.ComponentProps) {
  const { sets, contracts, canManage, canSetYear } = loaderData;
  return (
    <>
      <PageHeader
        title="Carbon"
        description="Emission factors by year and carrier, the supply contracts that give a supply its own market-based factor, and the financial year."
      />
      <div className="flex flex-col gap-6">
        <FactorSetsSection
          sets={sets}
          contracts={contracts}
          canManage={canManage}
          result={
            actionData && actionData.intent !== "financial-year"
              ? actionData
              : undefined
          }
        />
        <FinancialYearForm
          startMonth={loaderData.financialYearStart}
          canEdit={canSetYear}
          result={
            actionData?.intent === "financial-year" ? actionData : undefined
          }
        />
      </div>
    </>
  );
}
