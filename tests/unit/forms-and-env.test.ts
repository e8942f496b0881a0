import { describe, expect, it } from "vitest";
import { z } from "zod";
import { parseEnv } from "../../app/env.server";
import { emailField, parseForm } from "../../app/lib/forms";
import { safeRedirectPath } from "../../app/lib/redirect";

const schema = z.strictObject({ email: emailField });

function form(entries: [string, string | Blob][]): FormData {
  const data = new FormData();
  for (const [k, v] of entries) data.append(k, v);
  return data;
}

describe("parseForm", () => {
  it("returns parsed data for a valid form", () => {
    expect(parseForm(form([["email", " Ann@Example.org "]]), schema)).toEqual({
      ok: true,
      data: { email: "Ann@Example.org" },
    });
  });
  it("puts each problem under its field", () => {
    const result = parseForm(form([["email", "nope"]]), schema);
    expect(result).toEqual({
      ok: false,
      errors: { email: "Enter a valid e-mail address, like name@example.org." },
    });
  });
  it("refuses unknown fields, repeated fields and files", () => {
    expect(
      parseForm(
        form([
          ["email", "a@b.org"],
          ["admin", "1"],
        ]),
        schema,
      ).ok,
    ).toBe(false);
    expect(
      parseForm(
        form([
          ["email", "a@b.org"],
          ["email", "c@d.org"],
        ]),
        schema,
      ),
    ).toMatchObject({
      ok: false,
      errors: { form: expect.stringContaining("twice") },
    });
    expect(parseForm(form([["email", new Blob(["x"])]]), schema).ok).toBe(
      false,
    );
  });
});

describe("parseForm and text PostgreSQL cannot store", () => {
  const named = z.strictObject({ name: z.string(), note: z.string() });
  it("refuses a NUL in any field, under that field, before the schema", () => {
    expect(
      parseForm(
        form([
          ["name", "Boiler\u0000room"],
          ["note", "fine"],
        ]),
        named,
      ),
    ).toEqual({
      ok: false,
      errors: {
        name: "This contains a NUL character or a lone UTF-16 surrogate, which cannot be stored; remove it.",
      },
    });
  });
  it("takes every other character, astral ones included", () => {
    expect(
      parseForm(
        form([
          ["name", "Kesselhaus \u{1F525} ñ"],
          ["note", ""],
        ]),
        named,
      ),
    ).toEqual({ ok: true, data: { name: "Kesselhaus \u{1F525} ñ", note: "" } });
  });
});

describe("safeRedirectPath", () => {
  it("keeps same-site paths and drops anything else", () => {
    expect(safeRedirectPath("/o/abc/members?x=1")).toBe("/o/abc/members?x=1");
    expect(safeRedirectPath("//evil.example")).toBe("/");
    expect(safeRedirectPath("/\\evil.example")).toBe("/");
    expect(safeRedirectPath("https://evil.example")).toBe("/");
    expect(safeRedirectPath(null)).toBe("/");
  });

  it("refuses what a browser would turn into another host", () => {
    // Browsers drop tab and line breaks from URLs and read \ as /.
    for (const value of [
      "/\t/evil.example/",
      "/\r\n/evil.example",
      "/\n/evil.example",
      "/\u0000x",
      "/\u007fx",
      "/\\evil.example",
      "/%5C", // stays a path: kept, encoded
    ].slice(0, 6))
      expect(safeRedirectPath(value), JSON.stringify(value)).toBe("/");
    expect(safeRedirectPath("/%5Cevil.example")).toBe("/%5Cevil.example");
    expect(safeRedirectPath("/ledger#march")).toBe("/ledger#march");
  });
});

describe("parseEnv", () => {
  const base = {
    DATABASE_URL: "postgres://u:p@127.0.0.1:5432/db",
    RESEND_BASE_URL: "http://127.0.0.1:1",
    STRIPE_API_BASE: "http://127.0.0.1:2",
  };
  it("applies defaults: loopback and port 3000", () => {
    const env = parseEnv(base);
    expect(env.HOST).toBe("127.0.0.1");
    expect(env.PORT).toBe(3000);
  });
  it("names each bad value in one message", () => {
    expect(() =>
      parseEnv({ ...base, PORT: "eighty", DATABASE_URL: "mysql://x" }),
    ).toThrow(
      /PORT: PORT must be a number[\s\S]*DATABASE_URL: DATABASE_URL must start with postgres/,
    );
    expect(() => parseEnv({ ...base, PORT: "70000" })).toThrow(
      /between 1 and 65535/,
    );
    expect(() => parseEnv({ RESEND_BASE_URL: "http://x" })).toThrow(
      /DATABASE_URL is required/,
    );
  });
  it("needs either the local e-mail fake or a real key", () => {
    expect(() => parseEnv({ DATABASE_URL: base.DATABASE_URL })).toThrow(
      /RESEND_BASE_URL/,
    );
    expect(
      parseEnv({
        ...base,
        RESEND_BASE_URL: undefined,
        RESEND_API_KEY: "re_real",
      }).RESEND_BASE_URL,
    ).toBeUndefined();
    expect(() =>
      parseEnv({ ...base, RESEND_BASE_URL: "http://127.0.0.1:1/" }),
    ).toThrow(/must not end with/);
  });
  it("needs either the local Stripe fake or a real key, and a webhook secret of Stripe's form", () => {
    const noStripe = { ...base, STRIPE_API_BASE: undefined };
    expect(() => parseEnv(noStripe)).toThrow(/STRIPE_API_BASE/);
    const real = parseEnv({ ...noStripe, STRIPE_SECRET_KEY: "sk_live_x" });
    expect(real.STRIPE_API_BASE).toBeUndefined();
    expect(() =>
      parseEnv({ ...base, STRIPE_WEBHOOK_SECRET: "secret" }),
    ).toThrow(/must start with whsec_/);
    expect(() =>
      parseEnv({ ...base, REPORT_SIGNING_P12: "/etc/signer.p12" }),
    ).toThrow(/REPORT_SIGNING_P12_PASSWORD/);
  });
});
