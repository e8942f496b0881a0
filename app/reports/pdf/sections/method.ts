/**
 * Method notes: how every figure in the report was made, in the product's
 * own words, with the formulas, the property source, the unit factors, the
 * degree-day bases and the baseline criteria the app applies.
 */
import type { ReportData } from "../../data/types";
import { factor, share } from "../format";
import { drawFormula } from "../formula";
import { body, ensureSpace, frame, heading, newPage, space } from "../layout";
import { drawTable, widths } from "../table";
import { colours } from "../theme";

const FORMULA_SIZE = 10;

function formula(doc: PDFKit.PDFDocument, source: string) {
  ensureSpace(doc, FORMULA_SIZE + 22);
  const top = doc.y + 3;
  doc
    .rect(frame.left + 10, top - 3, 2, FORMULA_SIZE + 8)
    .fill(colours.spruce100);
  drawFormula(doc, source, frame.left + 20, top, FORMULA_SIZE);
  doc.y = top + FORMULA_SIZE + 9;
}

function note(doc: PDFKit.PDFDocument, text: Parameters<typeof body>[1]) {
  body(doc, text, { after: 4 });
}

function signConvention(doc: PDFKit.PDFDocument) {
  heading(doc, "Sign convention: two views, never mixed", 2);
  note(doc, [
    { text: "Delivered and exported energy by carrier. ", weight: "semibold" },
    {
      text: "The ledger's tables, totals and charts show what a site took in of each carrier as delivered energy (positive) and what it sent out as exported energy (negative), as EN ISO 52000-1 names them. Chilled water delivered to a site is cooling delivered, a positive quantity of its own carrier. Unlike carriers are never added into one kWh figure; only cost, carbon or primary energy could be totalled across them.",
    },
  ]);
  note(doc, [
    { text: "The thermodynamic view. ", weight: "semibold" },
    {
      text: "A site is a thermodynamic system, and its meters stand on its boundary. Following the IUPAC convention, energy that enters the site, as heat Q or as work W, is positive; energy that leaves it is negative:",
    },
  ]);
  formula(doc, "ΔU = Q + W");
  note(
    doc,
    "Cooling delivered is heat leaving the site (Q < 0): the site gives heat to the chilled-water loop, so chilled water measured by flow and return comes out negative by itself. Each meter has a boundary orientation: an import meter keeps the sign of what it measures; an export meter (solar power sent to the grid, heat sold to a neighbour) flips it. Hourly figures are stored in this view; the ledger turns a cooling meter's heat flow into cooling delivered, and each site's energy balance shows this view, labelled. Sub-meters hang under a parent inside the boundary, so the ledger sums boundary meters only.",
  );
}

function heat(doc: PDFKit.PDFDocument, data: ReportData) {
  heading(doc, "Heat in water, steam and other media", 2);
  note(
    doc,
    "Heating and chilled water: V is the volume the flow sensor registered at line conditions, so the density is taken where the sensor sits; ρ and the specific enthalpies h of liquid water come from IAPWS-IF97 region 1 (IAPWS R7-97(2012)).",
  );
  formula(doc, "Q = V·ρ(t_{sensor}, p)·(h(t_{flow}, p) − h(t_{return}, p))");
  note(
    doc,
    "Steam: m is the condensed mass. h″ is saturated vapour at the steam pressure (IF97 region 2 on the saturation line of region 4); the condensate is liquid water at its temperature and the steam pressure (region 1), or saturated liquid when no temperature is sent, which leaves the latent heat of condensation alone. Saturated steam has one degree of freedom (F = C − P + 2 = 1), so a pressure and a saturation temperature sent together must agree within 1 K, else the reading is rejected.",
  );
  formula(doc, "Q = m·(h″(p) − h_{condensate})");
  note(doc, "Other media, with a declared mean specific heat c:");
  formula(doc, "Q = m·c·(t_{in} − t_{out})");
  note(
    doc,
    `Properties are computed only within the meter range, 0 to 250 °C and 0.006 to 40 bar absolute, and in the right phase; a reading outside it is rejected, never extrapolated. Gauge pressure becomes absolute by adding the standard atmosphere, ${data.method.gaugeOffsetBar} bar.`,
  );
}

function work(doc: PDFKit.PDFDocument) {
  heading(doc, "Electrical work", 2);
  note(
    doc,
    "From volts, amps, power factor cosφ and the duration t of the interval:",
  );
  formula(doc, "W = V·I·t   (direct current)");
  formula(doc, "W = V·I·cosφ·t   (single-phase)");
  formula(
    doc,
    "W = √{3}·V_{LL}·I·cosφ·t = 3·V_{LN}·I·cosφ·t   (balanced three-phase)",
  );
  note(
    doc,
    "A cumulative register is a state of the meter; the energy of an interval is the difference of two reads times the meter's multiplier k. A register that drops is a roll-over only when the meter's roll-over point C is known and the wrapped advance is under half of C; any other drop (a meter swap, a reset) is flagged, never taken as negative energy.",
  );
  formula(
    doc,
    "W = (R_{end} − R_{start})·k,   or after a roll-over   W = (C − R_{start} + R_{end})·k",
  );
}

function uncertainty(doc: PDFKit.PDFDocument) {
  heading(doc, "Uncertainty band and estimated share", 2);
  note(
    doc,
    "A heat meter with an EN 1434 accuracy class has a maximum permissible error, in % of the true value, from its flow sensor, temperature pair and calculator (MID 2014/32/EU Annex VI). For class 2:",
  );
  formula(
    doc,
    "E = E_{f} + E_{t} + E_{c} = 3 + 4·Δθ_{min}/Δθ + 0.02·q_{p}/q   (%)",
  );
  note(
    doc,
    "Each reading's band is |Q|·E/100; the ledger adds the bands of a month's hours and of its meters, a bound that holds even when the errors are correlated. Meters without a rated class carry no band (shown as —). The estimated share is the energy from estimated hours over the energy metered in and out; estimates bridge short gaps in a straight line and longer ones with the meter's own weekly profile.",
  );
}

function units(doc: PDFKit.PDFDocument, data: ReportData) {
  heading(doc, "Energy units", 2, 120);
  note(
    doc,
    "Every figure is in kWh. The factors the app uses to show other units, from its unit table:",
  );
  const w = widths(1.1, 1.5, 4.2);
  drawTable(doc, {
    columns: [
      { header: "Unit", width: w[0] },
      { header: "kWh per unit", width: w[1], align: "right" },
      { header: "Source", width: w[2], wrap: true },
    ],
    rows: data.method.unitFactors.map((u) => ({
      cells: [
        u.unit,
        factor(u.kwh),
        { text: u.source, color: colours.inkMuted },
      ],
    })),
    caption: "Energy units",
  });
}

function degreeDays(doc: PDFKit.PDFDocument, data: ReportData) {
  heading(doc, "Degree days", 2, 120);
  note(
    doc,
    "From the mean outdoor temperature of each site-local day and the site's base temperature, by the mean-temperature method (CIBSE TM41; ISO 15927-6), summed over the days of the month:",
  );
  formula(
    doc,
    "HDD = Σ max(0, θ_{b} − θ_{m}),   CDD = Σ max(0, θ_{m} − θ_{b})   (K·day), with θ_{m} the day's mean and θ_{b} the base",
  );
  drawTable(doc, {
    columns: [
      { header: "Site", width: 220 },
      { header: "Degree day base (°C)", width: 110, align: "right" },
    ],
    rows: data.method.degreeDayBases.map((b) => ({
      cells: [b.siteName, b.baseC.toFixed(1)],
    })),
    caption: "Degree day bases",
  });
}

function baselines(doc: PDFKit.PDFDocument, data: ReportData) {
  heading(doc, "Baselines and their statistics", 2, 140);
  note(
    doc,
    "A baseline regresses a site's monthly delivered energy E of one carrier on the month's degree days DD by ordinary least squares, E = a + b·DD, and is saved with its data so later changes never alter it. Its fit is judged by ASHRAE Guideline 14, with y the metered energy, ŷ the model, n periods and p = 2 parameters; the divisor is n − p, and NMBE is positive when the metered energy lies above the model:",
  );
  formula(
    doc,
    "CV(RMSE) = 100·RMSE / mean(y),   RMSE = √{Σ(y_{i} − ŷ_{i})² / (n − p)}",
  );
  formula(doc, "NMBE = 100·Σ(y_{i} − ŷ_{i}) / ((n − p)·mean(y))");
  const g = data.method.guideline14;
  drawTable(doc, {
    columns: [
      { header: "Baseline periods", width: 220 },
      { header: "CV(RMSE) at most", width: 95, align: "right" },
      { header: "|NMBE| at most", width: 95, align: "right" },
    ],
    rows: [
      { cells: ["Monthly", `${g.monthly.cvrmse} %`, `${g.monthly.nmbe} %`] },
      {
        cells: [
          "Daily (held to the hourly criteria)",
          `${g.daily.cvrmse} %`,
          `${g.daily.nmbe} %`,
        ],
      },
    ],
    caption: "Guideline 14 criteria",
  });
  space(doc, 4);
  note(
    doc,
    "Against a baseline, each month's expected energy is the model at that month's degree days, to the base the model was fitted with. Avoided energy use (IPMVP) is the sum of the expected energy less the metered energy over the months that have both; it is positive when less energy was used than the weather explains. A month whose degree days lie outside those the model was fitted on is marked: the model is extrapolated there.",
  );
}

function balance(doc: PDFKit.PDFDocument, data: ReportData) {
  heading(doc, "Energy balance and month close", 2);
  note(
    doc,
    `A parent meter less the sum of its direct sub-meters is the distribution loss inside the boundary; a residual above ${share(data.method.residualTolerance, 0)} of the parent, or sub-meters that add up to more than their parent, is flagged.`,
  );
  formula(doc, "residual = E_{parent} − Σ E_{sub-meter}");
  note(
    doc,
    "Monthly figures are rolled up from hourly intervals in each site's own calendar and summed exactly (decimal arithmetic). A closed month is locked: the ledger keeps showing its figures as they were at the close, and any later change is an adjusting entry with its author, reason and time. A report whose months are not all closed is provisional.",
  );
}

export function drawMethod(doc: PDFKit.PDFDocument, data: ReportData): void {
  newPage(doc);
  heading(doc, "Method notes", 1);
  signConvention(doc);
  space(doc, 6);
  heat(doc, data);
  space(doc, 6);
  work(doc);
  space(doc, 6);
  uncertainty(doc);
  space(doc, 6);
  units(doc, data);
  space(doc, 10);
  degreeDays(doc, data);
  space(doc, 10);
  baselines(doc, data);
  space(doc, 6);
  balance(doc, data);
}
