import { Form } from "react-router";
import { Badge, Button, SelectField } from "~/components/ui";
import { calendarDay, dateTimeUtc, formatCost, formatKwh } from "~/lib/format";
import type { Bill, BillState } from "~/supplier-bills/bill-schema";
import { billStates } from "~/supplier-bills/bill-schema";

export interface BillHistoryEntry {
  billId: string;
  fromState: string | null;
  toState: string;
  note: string;
  actorName: string | null;
  at: string;
}

const stateTone: Record<BillState, "spruce" | "danger" | "frost"> = {
  agreed: "spruce",
  queried: "danger",
  resolved: "frost",
};

const stateLabel: Record<BillState, string> = {
  agreed: "Agreed",
  queried: "Queried",
  resolved: "Resolved",
};

function StateForm({ bill }: { bill: Bill }) {
  return (
    <Form method="post" className="flex flex-wrap items-end gap-2">
      <input type="hidden" name="intent" value="state" />
      <input type="hidden" name="billId" value={bill.id} />
      <SelectField
        label={`State of the bill for ${bill.supply}, ${bill.period_from}`}
        hideLabel
        name="state"
        defaultValue={bill.state}
      >
        {billStates.map((s) => (
          <option key={s} value={s}>
            {stateLabel[s]}
          </option>
        ))}
      </SelectField>
      <input
        name="note"
        required
        aria-label={`Note for the bill for ${bill.supply}, ${bill.period_from}`}
        placeholder="Why (a note)"
        className="min-h-10 rounded-lg border border-line-strong bg-surface px-3"
      />
      <Button type="submit" variant="secondary">
        Save
      </Button>
    </Form>
  );
}

function History({ entries }: { entries: BillHistoryEntry[] }) {
  return (
    <details>
      <summary className="cursor-pointer text-sm text-ink-muted">
        History ({entries.length})
      </summary>
      <ul className="mt-1 text-sm">
        {entries.map((e, i) => (
          <li key={i}>
            {dateTimeUtc(e.at)}:{" "}
            {e.fromState
              ? `${e.fromState} → ${e.toState}`
              : `checked on upload: ${e.toState}`}
            {e.actorName ? ` by ${e.actorName}` : ""}. {e.note}
          </li>
        ))}
      </ul>
    </details>
  );
}

/** The bills with what the meters and the tariff say beside each, its state and, for managers, a change of state. */
export function BillsTable({
  bills,
  history,
  canManage,
}: {
  bills: Bill[];
  history: BillHistoryEntry[];
  canManage: boolean;
}) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm" aria-label="Supplier bills">
        <thead>
          <tr className="border-b border-line">
            <th className="p-2">Supply</th>
            <th className="p-2">Period</th>
            <th className="p-2">Read</th>
            <th className="p-2 text-right">Billed</th>
            <th className="p-2 text-right">Metered</th>
            <th className="p-2 text-right">Billed amount</th>
            <th className="p-2 text-right">Tariff cost</th>
            <th className="p-2">State</th>
            <th className="p-2">Note</th>
          </tr>
        </thead>
        <tbody>
          {bills.map((bill) => (
            <tr
              key={bill.id}
              className="border-b border-line align-top"
              data-testid="bill-row"
            >
              <td className="p-2 font-semibold">{bill.supply}</td>
              <td className="p-2">
                {calendarDay(bill.period_from)} – {calendarDay(bill.period_to)}
              </td>
              <td className="p-2">{bill.read_type}</td>
              <td className="p-2 text-right">{formatKwh(Number(bill.kwh))}</td>
              <td className="p-2 text-right">
                {formatKwh(Number(bill.metered_kwh))}
              </td>
              <td className="p-2 text-right">
                {formatCost(bill.amount, bill.currency)}
              </td>
              <td className="p-2 text-right">
                {formatCost(bill.computed_cost, bill.currency)}
              </td>
              <td className="p-2" data-testid="bill-state">
                <Badge tone={stateTone[bill.state]}>
                  {stateLabel[bill.state]}
                </Badge>
              </td>
              <td className="p-2">
                <p>{bill.note}</p>
                <History
                  entries={history.filter((h) => h.billId === bill.id)}
                />
                {canManage ? <StateForm bill={bill} /> : null}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
