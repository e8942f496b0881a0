import { Notice } from "~/components/ui";
import { monthName } from "~/lib/months";
import { carrierLabels, carriers } from "~/sites/meter-schema";
import type { AuditFilterValues } from "./audit-filters";

/** The Ledger's link to a closed month's adjusting entries, said in words. */
export function LedgerScope({
  values,
  siteName,
  onClear,
}: {
  values: AuditFilterValues;
  siteName: string | undefined;
  onClear: () => void;
}) {
  if (!values.month && !values.carrier && !values.since) return null;
  const closed = values.since
    ? new Intl.DateTimeFormat("en-GB", {
        dateStyle: "medium",
        timeStyle: "short",
      }).format(new Date(values.since))
    : null;
  return (
    <Notice title="From the Ledger">
      Showing{" "}
      {values.kind === "adjustment" ? "the adjusting entries" : "entries"}
      {values.carrier
        ? ` to ${carrierLabels[values.carrier as (typeof carriers)[number]].toLowerCase()}`
        : ""}
      {siteName ? ` at ${siteName}` : ""}
      {values.month ? ` for ${monthName(values.month)}` : ""}
      {closed ? `, made since the month was closed (${closed})` : ""}.{" "}
      <button
        type="button"
        onClick={onClear}
        className="font-semibold underline"
      >
        Show all entries
      </button>
    </Notice>
  );
}
