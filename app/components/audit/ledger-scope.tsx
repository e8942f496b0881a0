import { Notice } from "~/components/ui";
import { dateTimeUtc, monthLong } from "~/lib/format";
import { carrierLabels, isCarrier } from "~/sites/meter-kinds";
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
  const closed = values.since ? dateTimeUtc(values.since) : null;
  return (
    <Notice title="From the Ledger">
      Showing{" "}
      {values.kind === "adjustment" ? "the adjusting entries" : "entries"}
      {isCarrier(values.carrier)
        ? ` to ${carrierLabels[values.carrier].toLowerCase()}`
        : ""}
      {siteName ? ` at ${siteName}` : ""}
      {values.month ? ` for ${monthLong(values.month)}` : ""}
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
