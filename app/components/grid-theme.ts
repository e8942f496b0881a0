import { themeQuartz } from "ag-grid-community";

/**
 * The look of every data grid (Ledger, Audit trail, a meter's hours): the
 * page's own font and colours from app/app.css, cells a little tighter
 * than the library's default so the figures fit beside each other.
 */
export const gridTheme = themeQuartz.withParams({
  fontFamily: "inherit",
  headerBackgroundColor: "#ece8df",
  accentColor: "#0f5546",
  borderColor: "#dcd6ca",
  fontSize: 14,
  cellHorizontalPaddingScale: 0.7,
});
