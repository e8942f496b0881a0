/**
 * Budgets and the carbon target of the financial year the period ends in:
 * budget, actual to date and forecast to year end, per site and carrier
 * (kWh of one carrier per row, never added across carriers), the money
 * beside it, and the estate's carbon against its target.
 */
import type { ReportData } from "../../data/types";
import { body, heading, space } from "../layout";
import { drawTable, widths, type Row } from "../table";
import { colours } from "../theme";
import { carrierLabels } from "~/sites/meter-kinds";
import { formatCost, formatNumber } from "~/lib/format";

const kwh = (value: string) => formatNumber(Number(value), 0, { fixed: true });
const money = (value: string | undefined, currency: string | undefined) =>
  value === undefined || currency === undefined
    ? "—"
    : formatCost(value, currency);

export function drawBudgets(doc: PDFKit.PDFDocument, data: ReportData): void {
  const { budgets } = data;
  space(doc, 18);
  heading(doc, `Budgets and target, ${budgets.label}`, 1, 140);
  body(
    doc,
    `Months to ${budgets.lastMonthToDate} are actual; the forecast adds each month still to come at its budget scaled by the year's actual-to-budget ratio so far. Energy is delivered energy of each carrier; money is the tariffs' cost including VAT.`,
    { color: colours.inkMuted, size: 8.5 },
  );
  space(doc, 4);
  if (budgets.rows.length === 0) body(doc, "No budgets are set for the year.");
  else {
    const w = widths(2.2, 1.1, 1.2, 1.2, 1.2, 1.2, 1.2, 1.2);
    const rows: Row[] = budgets.rows.map((b) => ({
      cells: [
        b.siteName,
        carrierLabels[b.carrier],
        kwh(b.budgetKwh),
        kwh(b.actualKwhToDate),
        kwh(b.forecastKwh),
        money(b.money?.budget, b.money?.currency),
        money(b.money?.actualToDate, b.money?.currency),
        money(b.money?.forecast, b.money?.currency),
      ],
    }));
    drawTable(doc, {
      columns: [
        { header: "Site", width: w[0] },
        { header: "Carrier", width: w[1] },
        { header: "Budget (kWh)", width: w[2], align: "right" },
        { header: "Actual to date (kWh)", width: w[3], align: "right" },
        { header: "Forecast (kWh)", width: w[4], align: "right" },
        { header: "Budget (money)", width: w[5], align: "right" },
        { header: "Actual to date", width: w[6], align: "right" },
        { header: "Forecast", width: w[7], align: "right" },
      ],
      rows,
    });
  }
  const target = budgets.carbon;
  if (target === null) return;
  space(doc, 6);
  body(
    doc,
    `Carbon target: ${target.reductionPercent} % below FY ${target.baseYear} (${target.basis}-based), an allowance of ${kwh(target.allowedKg)} kg CO₂e for the year. Actual to date ${kwh(target.actualKgToDate)} kg; forecast to year end ${kwh(target.forecastKg)} kg.`,
    { size: 9 },
  );
}
