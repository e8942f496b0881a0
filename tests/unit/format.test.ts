import { describe, expect, it } from "vitest";
import {
  calendarDay,
  dateTimeIn,
  dateTimeUtc,
  dayIn,
  dayMonthIn,
  dayMonthTimeIn,
  dayUtc,
  formatArea,
  formatCelsius,
  formatCount,
  formatDegreeDays,
  formatEnergy,
  formatHourKwh,
  formatKib,
  formatKwh,
  formatMoney,
  formatMwh,
  formatNumber,
  formatPercent,
  formatTick,
  monthLong,
  monthShort,
  timeAgo,
} from "../../app/lib/format";

const LONDON = "Europe/London";

describe("times on pages", () => {
  it("measures a relative time from the given now, not from the clock", () => {
    const now = "2026-03-01T12:00:00Z";
    expect(timeAgo("2026-03-01T11:56:00Z", now)).toBe("4 minutes ago");
    expect(timeAgo("2026-02-27T12:00:00Z", now)).toBe("2 days ago");
    expect(timeAgo(new Date("2026-03-01T12:00:30Z"), now)).toBe(
      "in 30 seconds",
    );
  });

  it("writes absolute times in UTC whatever the machine's zone", () => {
    // 23:30 UTC is already the next day in London summer time and Asia.
    const late = "2026-06-30T23:30:00Z";
    expect(dayUtc(late)).toBe("30 Jun 2026");
    expect(dateTimeUtc(late)).toBe("30 Jun 2026, 23:30 UTC");
    expect(dateTimeUtc("2026-01-05T03:04:05Z", { seconds: true })).toBe(
      "5 Jan 2026, 03:04:05 UTC",
    );
    expect(dateTimeUtc("2026-01-05T00:00:00Z")).toBe("5 Jan 2026, 00:00 UTC");
  });
});

describe("months and days, the house style", () => {
  it('writes a month "Nov 2026" in tables and "November 2026" in text', () => {
    expect(monthShort("2026-11")).toBe("Nov 2026");
    expect(monthLong("2026-11")).toBe("November 2026");
    expect(monthShort("2026-03-01")).toBe("Mar 2026");
  });

  it("uses three letters for every month, September too, whatever the ICU data", () => {
    expect(monthShort("2026-09")).toBe("Sep 2026");
    expect(dayUtc("2026-09-14T10:00:00Z")).toBe("14 Sep 2026");
    expect(monthShort("2026-06")).toBe("Jun 2026");
    expect(monthShort("2026-07")).toBe("Jul 2026");
  });

  it("gives back what is not a month as it is", () => {
    expect(monthShort("soon")).toBe("soon");
    expect(monthLong("2026-13")).toBe("2026-13");
    expect(calendarDay("someday")).toBe("someday");
  });

  it('writes a calendar day "24 Nov 2026"', () => {
    expect(calendarDay("2026-11-24")).toBe("24 Nov 2026");
    expect(calendarDay("2026-01-01")).toBe("1 Jan 2026");
  });
});

describe("times in a site's zone (Europe/London) across the clock changes", () => {
  it("before, on and after the spring change of 29 March 2026", () => {
    // 00:30 UTC is 00:30 GMT; 01:30 UTC is 02:30 BST, the clocks having gone forward at 01:00 UTC.
    expect(dateTimeIn("2026-03-29T00:30:00Z", LONDON)).toBe(
      "29 Mar 2026, 00:30",
    );
    expect(dateTimeIn("2026-03-29T01:30:00Z", LONDON)).toBe(
      "29 Mar 2026, 02:30",
    );
    expect(dateTimeIn("2026-03-30T12:00:00Z", LONDON)).toBe(
      "30 Mar 2026, 13:00",
    );
  });

  it("the autumn change of 25 October 2026 shows 01:xx twice", () => {
    expect(dateTimeIn("2026-10-25T00:30:00Z", LONDON)).toBe(
      "25 Oct 2026, 01:30",
    );
    expect(dateTimeIn("2026-10-25T01:30:00Z", LONDON)).toBe(
      "25 Oct 2026, 01:30",
    );
    expect(dateTimeIn("2026-10-25T02:30:00Z", LONDON)).toBe(
      "25 Oct 2026, 02:30",
    );
  });

  it("a summer evening in UTC is the next day in London", () => {
    const at = "2026-06-30T23:30:00Z";
    expect(dayIn(at, LONDON)).toBe("1 Jul 2026");
    expect(dayUtc(at)).toBe("30 Jun 2026");
    expect(dayMonthIn(at, LONDON)).toBe("1 Jul");
    expect(dayMonthTimeIn(at, LONDON)).toBe("1 Jul, 00:30");
  });

  it("midnight is 00:00, never 24:00", () => {
    expect(dateTimeIn("2026-01-10T00:00:00Z", LONDON)).toBe(
      "10 Jan 2026, 00:00",
    );
  });
});

describe("numbers, one precision per unit", () => {
  it("groups digits and writes a real minus sign, no sign on a rounded zero", () => {
    expect(formatCount(12345)).toBe("12,345");
    expect(formatNumber(-1234.56, 1)).toBe("\u22121,234.6");
    expect(formatNumber(-0.04, 1)).toBe("0");
    expect(formatNumber(2.5, 1, { plus: true })).toBe("+2.5");
    expect(formatNumber(2, 2, { fixed: true })).toBe("2.00");
  });

  it("an hour's energy keeps at most three decimals", () => {
    expect(formatHourKwh(12.3456)).toBe("12.346");
    expect(formatHourKwh(-12.5)).toBe("\u221212.5");
    expect(formatHourKwh(4, 1)).toBe("4.0");
    expect(formatHourKwh(1234.5)).toBe("1,234.5");
  });

  it("totals in whole kWh or tenths of a MWh, at the scale that reads best", () => {
    expect(formatKwh(1234.4)).toBe("1,234 kWh");
    expect(formatMwh(12.345)).toBe("12.3 MWh");
    expect(formatEnergy(850.4, { plus: true })).toBe("+850 kWh");
    expect(formatEnergy(-12_345, { plus: true })).toBe("\u221212.3 MWh");
    expect(formatEnergy(999.4)).toBe("999 kWh");
    expect(formatEnergy(1000)).toBe("1 MWh");
  });

  it("degree days and temperatures in tenths, °C kept with its figure", () => {
    expect(formatDegreeDays(312.46)).toBe("312.5 degree days");
    expect(formatCelsius(15.5)).toBe("15.5\u00a0°C");
    expect(formatCelsius(15)).toBe("15.0\u00a0°C");
  });

  it("percentages from fractions, one decimal unless asked", () => {
    expect(formatPercent(0.1234)).toBe("12.3 %");
    expect(formatPercent(-0.004)).toBe("\u22120.4 %");
    expect(formatPercent(0)).toBe("0.0 %");
    expect(formatPercent(0.05, { decimals: 0 })).toBe("5 %");
  });

  it("areas, sizes and axis ticks", () => {
    expect(formatArea(12400)).toBe("12,400 m²");
    expect(formatKib(2_100_000)).toBe("2,051 KiB");
    expect(formatTick(2500)).toBe("2,500");
    expect(formatTick(0.25)).toBe("0.25");
  });

  it("money in minor units through the currency style", () => {
    expect(formatMoney(2900, "gbp")).toBe("£29.00");
    expect(formatMoney(123456, "EUR")).toBe("€1,234.56");
  });

  it("writes a dash where there is no figure", () => {
    for (const missing of [null, undefined, NaN, Infinity])
      expect(formatNumber(missing, 1)).toBe("\u2014");
    expect(formatKwh(null)).toBe("\u2014");
    expect(formatKwh(98765.4)).toBe("98,765 kWh");
    expect(formatKwh(0)).toBe("0 kWh");
  });
});
