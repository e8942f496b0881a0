/**
 * The standing cautions of design.md, in one wording for the pages
 * (app/components/cautions.tsx) and the signed reports.
 */
export const CAUTIONS = [
  "Figures are for energy management, not for trade.",
  "Billing third parties from sub-meters needs meters approved under your local legal-metrology rules.",
  "Steam and pressurised hot water are hazardous: installation and maintenance belong to qualified people working to local codes.",
] as const;
