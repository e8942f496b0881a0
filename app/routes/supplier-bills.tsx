import { data, useActionData } from "react-router";
import { idParam, notFound } from "~/auth/membership.server";
import { requirePermission } from "~/auth/page-access.server";
import { can } from "~/auth/permissions";
import { BillUploadForm } from "~/components/supplier-bills/bill-upload-form";
import { BillsTable } from "~/components/supplier-bills/bills-table";
import { ToleranceForm } from "~/components/supplier-bills/tolerance-form";
import { EmptyState, Notice, PageHeader } from "~/components/ui";
import { parseForm } from "~/lib/forms";
import type { RowProblem } from "~/supplier-bills/bill-file";
import {
  billStateChangeSchema,
  toleranceSchema,
} from "~/supplier-bills/bill-schema";
import {
  billHistory,
  changeBillState,
  getTolerance,
  listBills,
  setTolerance,
  uploadBills,
} from "~/supplier-bills/bills.server";
import { readBillFile } from "~/supplier-bills/read-bill-file.server";
import type { Route } from "./+types/supplier-bills";

export const meta: Route.MetaFunction = () => [
  { title: "Supplier bills · Joulebook" },
];

export async function loader({ context }: Route.LoaderArgs) {
  const { organization, role } = requirePermission(context, "bills.view");
  const [bills, history, tolerance] = await Promise.all([
    listBills(organization.id),
    billHistory(organization.id),
    getTolerance(organization.id),
  ]);
  return {
    bills,
    history,
    tolerance,
    canManage: can(role, "bills.manage"),
    orgId: organization.id,
  };
}

type Result = {
  errors: Record<string, string>;
  problems?: RowProblem[];
  message?: string;
};

export async function action({ request, context }: Route.ActionArgs) {
  const { organization, user } = requirePermission(context, "bills.manage");
  const actor = { organizationId: organization.id, actorUserId: user.id };
  let formData: FormData;
  try {
    formData = await request.formData();
  } catch {
    return data<Result>(
      { errors: { form: "The form could not be read. Try again." } },
      { status: 400 },
    );
  }
  const intent = formData.get("intent");
  formData.delete("intent");
  if (intent === "upload") {
    const file = formData.get("file");
    if (!(file instanceof File))
      return data<Result>(
        { errors: { file: "Choose a file of bills." } },
        { status: 400 },
      );
    const read = await readBillFile(file);
    if (!read.ok)
      return data<Result>(
        { errors: {}, problems: read.problems },
        { status: 400 },
      );
    const outcome = await uploadBills(actor, read.rows);
    if (!outcome.ok)
      return data<Result>(
        { errors: {}, problems: outcome.problems },
        { status: 400 },
      );
    return data<Result>({
      errors: {},
      message: `Checked: ${outcome.stored} stored (${outcome.agreed} agreed, ${outcome.queried} queried), ${outcome.alreadyStored} already stored.`,
    });
  }
  if (intent === "state") {
    const billId = idParam(
      String(formData.get("billId") ?? ""),
      "No such bill.",
    );
    formData.delete("billId");
    const form = parseForm(formData, billStateChangeSchema);
    if (!form.ok) return data<Result>({ errors: form.errors }, { status: 400 });
    const bill = await changeBillState(
      actor,
      billId,
      form.data.state,
      form.data.note,
    );
    if (!bill) notFound("No such bill.");
    return data<Result>({
      errors: {},
      message: `The bill for ${bill.supply} from ${bill.period_from} is ${bill.state}.`,
    });
  }
  if (intent === "tolerance") {
    const form = parseForm(formData, toleranceSchema);
    if (!form.ok) return data<Result>({ errors: form.errors }, { status: 400 });
    await setTolerance(actor, form.data);
    return data<Result>({ errors: {}, message: "Tolerance saved." });
  }
  return data<Result>({ errors: { form: "Unknown action." } }, { status: 400 });
}

export default function SupplierBills({ loaderData }: Route.ComponentProps) {
  const { bills, history, tolerance, canManage, orgId } = loaderData;
  const result = useActionData<typeof action>();
  const errors = result?.errors ?? {};
  const queried = bills.filter((b) => b.state === "queried").length;
  return (
    <>
      <PageHeader
        title="Supplier bills"
        description="Each supplier's bill beside the kWh the meters recorded and the cost the tariff gives for the same supply and months. A difference beyond the tolerance is queried."
        actions={
          queried > 0 ? (
            <a
              className="font-semibold text-spruce-800 underline"
              href={`/o/${orgId}/supplier-bills/queried.csv`}
              download
            >
              Download the {queried} queried bill{queried === 1 ? "" : "s"}{" "}
              (CSV)
            </a>
          ) : null
        }
      />
      {result?.message ? (
        <Notice tone="success">{result.message}</Notice>
      ) : null}
      {errors.form || errors.file || errors.note || errors.state ? (
        <Notice tone="error">
          {errors.form ?? errors.file ?? errors.note ?? errors.state}
        </Notice>
      ) : null}
      {result?.problems ? (
        <section className="mb-4" aria-label="Refused">
          <Notice tone="error">
            Nothing from the file was stored. Correct these rows and upload it
            again.
          </Notice>
          <table
            className="mt-2 text-sm"
            aria-label="Problems in the bill file"
          >
            <thead>
              <tr>
                <th className="p-2 text-left">Row</th>
                <th className="p-2 text-left">Reason</th>
              </tr>
            </thead>
            <tbody>
              {result.problems.map((p) => (
                <tr key={`${p.row}-${p.reason}`}>
                  <td className="p-2">{p.row || "—"}</td>
                  <td className="p-2">{p.reason}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      ) : null}
      <section className="mt-4" aria-label="Bills">
        {bills.length === 0 ? (
          <EmptyState title="No bills yet">
            Upload a supplier&apos;s bills to check them against the meters and
            the tariffs.
          </EmptyState>
        ) : (
          <BillsTable bills={bills} history={history} canManage={canManage} />
        )}
      </section>
      <div className="mt-6 grid gap-4 lg:grid-cols-2">
        {canManage ? <BillUploadForm /> : null}
        <ToleranceForm
          tolerance={tolerance}
          canManage={canManage}
          errors={errors}
        />
      </div>
    </>
  );
}
