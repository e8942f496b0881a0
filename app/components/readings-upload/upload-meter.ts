import type { UploadMeter } from "~/ingest/supplier-files/fit-to-meters";

/** A meter as the Readings loader hands it to the upload: its code, kind, site clock and resolution. */
export interface PageMeter extends UploadMeter {
  id: string;
  name: string;
  siteName: string;
  timeZone: string;
}
