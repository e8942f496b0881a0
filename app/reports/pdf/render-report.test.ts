/**
 * Drawing without a database: a hand-made report with the awkward cases
 * (cooling delivered beyond the heat, so a negative thermodynamic net;
 * sub-meters over their parent, a baseline without weather,
 * a site without entries, long reasons, names outside Latin-1) and an empty
 * one must draw, paginate and end as a PDF.
 */
import { describe, expect, it } from "vitest";
import { CAUTIONS } from "~/lib/cautions";
import { methodFacts } from "../data/method-facts";
import type { ReportData, SiteReport } from "../data/types";
import { reportPeriod } from "../periods";
import {
  createReportDocument,
  drawReport,
  pdfBytes,
} from "./render-report.server";

const entry = (
  month: string,
  carrier: "heat" | "cooling" | "electricity",
  net: string,
) => ({
  month,
  carrier,
  importsKwh: net,
  exportsKwh: "0",
  netKwh: net,
  estimatedKwh: "0",
  estimatedShare: 0,
  uncertaintyKwh: carrier === "electricity" ? null : "12.5",
  status: "closed" as const,
  adjustmentsKwh: "0",
  adjustmentCount: 0,
  cost: "123.4567",
  currency: "GBP",
});

const total = (net: string) => ({
  importsKwh: net,
  exportsKwh: "0",
  netKwh: net,
  estimatedShare: 0,
  uncertaintyKwh: null,
  adjustmentsKwh: "0",
  adjustmentCount: 0,
  cost: "370.3701",
  currency: "GBP",
});

function site(name: string, withData: boolean): SiteReport {
  const months = ["2025-01", "2025-02", "2025-03"];
  const heat = months.map((m) => entry(m, "heat", "1234.5"));
  // Cooling delivered: positive in the ledger, heat out of the site.
  const cooling = months.map((m) => entry(m, "cooling", "4000.25"));
  return {
    id: name,
    name,
    timeZone: "Europe/Warsaw",
    degreeDayBaseC: 15.5,
    floorAreaM2: 1200,
    archived: false,
    tables: withData
      ? [
          { carrier: "heat", entries: heat, total: total("3703.5") },
          { carrier: "cooling", entries: cooling, total: total("12000.75") },
        ]
      : [],
    baselines: withData
      ? [
          {
            carrier: "heat",
            baselineId: "b",
            from: "2024-01",
            to: "2024-12",
            granularity: "monthly",
            driver: "hdd",
            baseC: 15.5,
            siteBaseC: 16,
            intercept: 100,
            slope: 2.5,
            n: 12,
            p: 2,
            r2: 0.8,
            cvrmse: 22,
            nmbe: -6,
            assessment: {
              cvrmse: { value: 22, limit: 15, pass: false },
              nmbe: { value: -6, limit: 5, pass: false },
            },
            shortFitWarning:
              "Fitted on 9 months, fewer than the 12 of a full year: treat with caution.",
            createdAt: "2025-01-01T00:00:00.000Z",
            createdBy: null,
            months: months.map((month, i) => ({
              month,
              hdd: i === 2 ? null : 300,
              cdd: i === 2 ? null : 0,
              dd: i === 2 ? null : 300,
              weatherDays: i === 2 ? 0 : 31,
              daysInMonth: 31,
              actualKwh: 1234.5,
              expectedKwh: i === 2 ? null : 850,
              difference: i === 2 ? null : 0.45,
              extrapolated: i === 1,
              note: i === 2 ? "no weather" : null,
            })),
            comparedMonths: 2,
            expectedKwh: 1700,
            actualKwh: 2469,
            avoidedKwh: -769,
            avoidedPercent: -45.2,
          },
        ]
      : [],
    balance: {
      carriers: withData
        ? [
            {
              carrier: "heat",
              importsKwh: "3703.5",
              exportsKwh: "0",
              netKwh: "3703.5",
            },
            {
              carrier: "cooling",
              importsKwh: "12000.75",
              exportsKwh: "0",
              netKwh: "12000.75",
            },
          ]
        : [],
      // Q + W: 3703.5 of heat in, 12000.75 of heat out as cooling delivered.
      netIntoSiteKwh: withData ? "-8297.25" : "0",
      residuals: withData
        ? [
            {
              code: "HX-0",
              name: "Main heat meter",
              carrier: "heat",
              parentKwh: "3703.5",
              childrenKwh: "3800",
              residualKwh: "-96.5",
              residualFraction: -0.026,
              childCount: 2,
              flag: "children_exceed_parent",
            },
          ]
        : [],
    },
  };
}

function report(sites: SiteReport[]): ReportData {
  const period = reportPeriod("quarter", "2025-Q1");
  return {
    reportId: "11111111-2222-4333-8444-555555555555",
    organization: { id: "o", name: "Łódź Δ Estates" },
    scope: { siteId: null, label: "All sites" },
    period,
    generatedAt: "2025-04-02T09:30:00.000Z",
    timeZone: "Europe/Warsaw",
    authorName: "Zoë Tester",
    months: ["2025-01", "2025-02", "2025-03"].map((month) => ({
      month,
      closed: true,
      closedForOrganisation: true,
      sitesWithEntries: 1,
      sitesClosed: 1,
    })),
    closedMonths: 3,
    allMonthsClosed: true,
    carrierTotals: sites.length
      ? [{ carrier: "heat", ...total("3703.5") }]
      : [],
    sites,
    adjustments: sites.length
      ? Array.from({ length: 40 }, (_, i) => ({
          id: i,
          recordedAt: "2025-04-01T10:00:00.000Z",
          month: "2025-02",
          siteName: sites[0].name,
          meterCode: "HX-1",
          meterName: "Block A",
          carrier: "heat" as const,
          subMeter: true,
          deltaKwh: "-1.25",
          source: "edit",
          reason:
            "Corrected after the flow sensor was found mounted against the flow direction; the installer's report is on file. ".repeat(
              2,
            ),
          author: "Gateway roof-7",
        }))
      : [],
    dataQuality: {
      meters: [],
      expectedHours: 0,
      measuredHours: 0,
      estimatedHours: 0,
      editedHours: 0,
      missingHours: 0,
      silentAfterHours: 24,
      silentMeters: 0,
      conflicts: 0,
      openConflicts: 0,
    },
    plantChecks: sites.length
      ? {
          plants: 2,
          faults: [
            {
              plantId: "p1",
              plantName: "Boiler house Ω",
              kind: "boiler",
              kindLabel: "Boiler",
              siteName: sites[0].name,
              month: "2025-02",
              meterCodes: ["G-1", "H-1"],
              text: "Metering fault: Efficiency (gross CV) 104.0 %, above the limit of 100.0 %.",
            },
          ],
        }
      : { plants: 0, faults: [] },
    method: methodFacts(
      sites.map((s) => ({ name: s.name, degreeDayBaseC: s.degreeDayBaseC })),
    ),
    cautions: [...CAUTIONS],
    carbon: {
      byCarrier: [
        { carrier: "heat", co2eKg: "1234.5", co2eMarketKg: "1234.5" },
      ],
      totalKg: "1234.5",
      totalMarketKg: "1234.5",
      rowsWithoutFactor: 0,
      sources: [
        {
          year: 2025,
          carrier: "heat",
          scope: 2,
          source: "Test factors, not an official publication",
          version: "t1",
        },
      ],
    },
    budgets: {
      label: "FY 2025/26",
      lastMonthToDate: "2025-02",
      rows: [
        {
          siteName: "Płock Δ-Block",
          carrier: "heat",
          budgetKwh: "120000.000",
          actualKwhToDate: "20500.250",
          forecastKwh: "121000.000",
          money: {
            currency: "GBP",
            budget: "11000.00",
            actualToDate: "1900.00",
            forecast: "11100.00",
          },
        },
      ],
      carbon: {
        reductionPercent: "10",
        baseYear: 2024,
        basis: "location",
        allowedKg: "90000.000",
        actualKgToDate: "15000.000",
        forecastKg: "92000.000",
      },
    },
  };
}

async function render(data: ReportData) {
  const doc = createReportDocument({ title: "t", subject: "s", author: "a" });
  const early = pdfBytes(doc);
  const progress: number[] = [];
  const { pageCount } = await drawReport(doc, data, (fraction) => {
    progress.push(fraction);
  });
  doc.end();
  const bytes = await early;
  expect(await pdfBytes(doc)).toBe(bytes);
  return { pageCount, bytes, progress };
}

describe("drawReport", () => {
  it("draws every section of a hand-made report and ends a PDF 1.7", async () => {
    const { pageCount, bytes, progress } = await render(
      report([site("Płock Δ-Block", true), site("Empty annexe", false)]),
    );
    expect(bytes.subarray(0, 8).toString("latin1")).toBe("%PDF-1.7");
    expect(bytes.subarray(-6).toString("latin1")).toContain("%%EOF");
    expect(pageCount).toBeGreaterThanOrEqual(7);
    expect(progress.at(-1)).toBe(1);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
  });

  it("draws an organisation with no sites and no figures", async () => {
    const { pageCount } = await render(report([]));
    expect(pageCount).toBeGreaterThanOrEqual(3);
  });

  it("refuses a document it did not make", () => {
    expect(() => pdfBytes({} as PDFKit.PDFDocument)).toThrow(
      /createReportDocument/,
    );
  });
});
