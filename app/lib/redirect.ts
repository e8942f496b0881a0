/**
 * Only same-origin paths are followed after sign-in, never another host.
 *
 * Browsers drop tabs and line breaks from URLs and read `\` as `/`, so
 * `/\t/evil.example` or `/\\evil.example` become `//evil.example`, another
 * host. Any control character or backslash gives the fallback, and so does a
 * path that does not stay on our origin once a URL parser has read it.
 */
const PROBE_ORIGIN = "http://joulebook.invalid";

export function safeRedirectPath(value: unknown, fallback = "/"): string {
  if (typeof value !== "string" || !value.startsWith("/")) return fallback;
  // eslint-disable-next-line no-control-regex
  if (/[\u0000-\u001f\u007f\\]/.test(value)) return fallback;
  let url: URL;
  try {
    url = new URL(value, PROBE_ORIGIN);
  } catch {
    return fallback;
  }
  if (url.origin !== PROBE_ORIGIN) return fallback;
  return `${url.pathname}${url.search}${url.hash}`;
}
