import { isUuid } from "~/lib/ids";
import {
  MAX_WEATHER_BYTES,
  parseWeatherCsv,
  type WeatherUploadResult,
} from "./weather-csv";
import { storeWeather } from "./weather.server";

export const UPLOAD_TOO_LARGE = `The upload is larger than ${(MAX_WEATHER_BYTES / 1e6).toLocaleString("en-GB")} MB; send the weather in parts.`;

const FIELDS = ["intent", "siteId", "file"];

/**
 * The weather upload form, checked and stored: one site, one CSV file
 * (MAX_WEATHER_BYTES at most) whose every row is good, or nothing is stored.
 * `siteOf` gives the chosen site of the organisation, or throws (another
 * organisation's site must look like no site at all).
 */
export async function uploadWeather({
  formData,
  organizationId,
  actorUserId,
  siteOf,
}: {
  formData: FormData;
  organizationId: string;
  actorUserId: string;
  siteOf: (siteId: string) => Promise<{ id: string; name: string }>;
}): Promise<{ status: number; result: WeatherUploadResult }> {
  const fail = (errors: Record<string, string>, status = 400) => ({
    status,
    result: { intent: "upload-weather" as const, errors },
  });
  const keys = [...new Set(formData.keys())];
  if (keys.some((k) => !FIELDS.includes(k)))
    return fail({ form: "The form has fields it should not have." });
  const chosen = formData.get("siteId");
  const siteId = typeof chosen === "string" ? chosen.trim() : "";
  if (!isUuid(siteId) || formData.getAll("siteId").length !== 1)
    return fail({ siteId: "Choose a site." });
  const site = await siteOf(siteId);
  const file = formData.get("file");
  if (!(file instanceof File) || formData.getAll("file").length !== 1)
    return fail({ file: "Choose a CSV file." });
  if (file.size === 0) return fail({ file: "The file is empty." });
  if (file.size > MAX_WEATHER_BYTES)
    return fail({ file: UPLOAD_TOO_LARGE }, 413);
  const parsed = parseWeatherCsv(await file.text());
  if (!parsed.ok)
    return {
      status: 400,
      result: {
        intent: "upload-weather",
        errors: parsed.file
          ? { file: `${parsed.file} Nothing was stored.` }
          : {
              file: `${parsed.problemCount} rows have problems; nothing was stored.`,
            },
        problems: parsed.problems,
        problemCount: parsed.problemCount,
      },
    };
  const stored = await storeWeather({
    organizationId,
    siteId: site.id,
    actorUserId,
    rows: parsed.rows,
  });
  const count = (n: number) => n.toLocaleString("en-GB");
  return {
    status: 200,
    result: {
      intent: "upload-weather",
      errors: {},
      message: `Stored ${count(parsed.rows.length)} days for ${site.name}, ${stored.from} to ${stored.to}: ${count(stored.inserted)} new, ${count(stored.updated)} replaced.`,
    },
  };
}
