// Days on which the estate's buildings are closed or run differently. Local
// calendar dates (Europe/London), "YYYY-MM-DD".

// Bank holidays in England for the scenario years and the year after, which
// the live demo runs into (the published dates).
const PUBLIC_HOLIDAYS = new Set([
  "2024-12-25",
  "2024-12-26",
  "2025-01-01",
  "2025-04-18",
  "2025-04-21",
  "2025-05-05",
  "2025-05-26",
  "2025-08-25",
  "2025-12-25",
  "2025-12-26",
  "2026-01-01",
  "2026-04-03",
  "2026-04-06",
  "2026-05-04",
  "2026-05-25",
  "2026-08-31",
  "2026-12-25",
  "2026-12-28",
  "2027-01-01",
  "2027-03-26",
  "2027-03-29",
  "2027-05-03",
  "2027-05-31",
  "2027-08-30",
  "2027-12-27",
  "2027-12-28",
]);

// Northgate Primary's holidays (invented, in the usual English pattern of
// three terms with a half-term break in each), first and last day inclusive.
const SCHOOL_HOLIDAYS: readonly [string, string][] = [
  ["2024-12-21", "2025-01-05"],
  ["2025-02-15", "2025-02-23"],
  ["2025-04-05", "2025-04-21"],
  ["2025-05-24", "2025-06-01"],
  ["2025-07-23", "2025-09-02"],
  ["2025-10-25", "2025-11-02"],
  ["2025-12-20", "2026-01-04"],
  ["2026-02-14", "2026-02-22"],
  ["2026-03-28", "2026-04-12"],
  ["2026-05-23", "2026-05-31"],
  ["2026-07-22", "2026-09-01"],
  ["2026-10-24", "2026-11-01"],
  ["2026-12-19", "2027-01-03"],
  ["2027-02-13", "2027-02-21"],
  ["2027-03-27", "2027-04-11"],
  ["2027-05-29", "2027-06-06"],
  ["2027-07-21", "2027-09-01"],
  ["2027-10-23", "2027-10-31"],
  ["2027-12-18", "2028-01-03"],
];

export function isPublicHoliday(localDate: string): boolean {
  return PUBLIC_HOLIDAYS.has(localDate);
}

export function isSchoolHoliday(localDate: string): boolean {
  // ISO dates compare correctly as strings.
  return SCHOOL_HOLIDAYS.some(([a, b]) => localDate >= a && localDate <= b);
}
