import { execSync } from "node:child_process";
import { chromium, type Browser } from "playwright-core";

/** Debian's chromium, found on PATH; nothing downloads a browser. */
export function chromiumPath(): string {
  return execSync("command -v chromium || command -v chromium-browser", {
    shell: "/bin/bash",
    encoding: "utf8",
  }).trim();
}

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: chromiumPath(),
    args: [
      "--headless",
      "--no-sandbox",
      "--disable-gpu",
      "--disable-quic",
      "--no-first-run",
      "--disable-background-networking",
      "--disable-component-update",
      "--disable-sync",
    ],
  });
}
