/**
 * Reports end to end through the running server: request one as a manager,
 * watch it finish, download it, check it with Poppler's pdfsig (an outside
 * verifier), then the Verify page with a genuine, a tampered, a truncated and
 * a foreign PDF, and the role and organisation checks around all of it.
 */
import { execFile } from "node:child_process";
import { mkdtemp, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { eq } from "drizzle-orm";
import PDFDocument from "pdfkit";
import { afterAll, beforeAll, beforeEach, describe, expect, it } from "vitest";
import { Client, latestEmailTo } from "../support/http";
import { db, pool, schema } from "../support/db";
import { createMeteredOrg, type MeteredOrg } from "../support/metered-org";

const run = promisify(execFile);

afterAll(() => pool.end());
beforeEach(async () => {
  await db.delete(schema.signInAttempts);
});

const ROLES = ["owner", "energy_manager", "finance", "auditor"] as const;

async function signedIn(org: MeteredOrg, role: (typeof ROLES)[number]) {
  const person = org.org.members[ROLES.indexOf(role)];
  const client = new Client();
  await client.signIn(person.email, person.password);
  return client;
}

/** Two days of hourly register reads in March 2026, so the ledger has data. */
async function postMarchReadings(org: MeteredOrg) {
  const t0 = Date.parse("2026-03-10T00:00:00Z");
  const readings = Array.from({ length: 49 }, (_, i) => ({
    meter: org.meters.register.code,
    quantity: "electric_register",
    time: new Date(t0 + i * 3_600_000).toISOString(),
    register_kwh: 5000 + i * 12.5,
  }));
  const response = await new Client().postJson(
    "/api/v1/readings",
    { readings },
    { authorization: `Bearer ${org.gatewayKey}` },
  );
  expect(response.status).toBe(200);
}

async function waitForReport(orgId: string, reportId: string) {
  const deadline = Date.now() + 60_000;
  while (Date.now() < deadline) {
    const [row] = await db
      .select({ status: schema.reports.status, error: schema.reports.error })
      .from(schema.reports)
      .where(eq(schema.reports.id, reportId));
    if (row?.status === "done") return;
    if (row?.status === "failed")
      throw new Error(`report failed: ${row.error}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`report ${reportId} in ${orgId} did not finish in 60 s`);
}

async function requestMarchReport(org: MeteredOrg, client: Client) {
  const response = await client.post(`/o/${org.org.id}/reports`, {
    scope: "all",
    period: "month:2026-03",
  });
  expect(response.status).toBe(200);
  const [row] = await db
    .select({ id: schema.reports.id })
    .from(schema.reports)
    .where(eq(schema.reports.organizationId, org.org.id))
    .orderBy(schema.reports.createdAt);
  await waitForReport(org.org.id, row.id);
  return row.id;
}

async function download(org: MeteredOrg, client: Client, reportId: string) {
  const response = await client.get(`/o/${org.org.id}/reports/${reportId}/pdf`);
  expect(response.status).toBe(200);
  expect(response.headers.get("content-type")).toBe("application/pdf");
  return Buffer.from(await response.arrayBuffer());
}

async function verify(org: MeteredOrg, client: Client, bytes: Buffer) {
  const form = new FormData();
  form.set("file", new Blob([new Uint8Array(bytes)]), "upload.pdf");
  const response = await client.request(`/o/${org.org.id}/reports/verify`, {
    method: "POST",
    body: form,
  });
  return { status: response.status, html: await response.text() };
}

/** pdfsig's verdict line; it exits 0 whatever it finds. */
async function pdfsig(bytes: Buffer): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), "jb-report-"));
  const file = join(dir, "report.pdf");
  await writeFile(file, bytes);
  const { stdout } = await run("pdfsig", [file]);
  return stdout;
}

/** Flips one byte well inside the first signed range (page content). */
function tampered(bytes: Buffer): Buffer {
  const copy = Buffer.from(bytes);
  const at = Math.floor(copy.indexOf("/ByteRange") / 2);
  copy[at] = copy[at] ^ 0x01;
  return copy;
}

function unsignedPdf(): Promise<Buffer> {
  return new Promise((resolve) => {
    const doc = new PDFDocument();
    const chunks: Buffer[] = [];
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.text("Not a Joulebook report");
    doc.end();
  });
}

describe("signed reports", () => {
  let org: MeteredOrg;
  let reportId: string;
  let pdf: Buffer;

  beforeAll(async () => {
    org = await createMeteredOrg({ roles: [...ROLES] });
    await postMarchReadings(org);
    const manager = await signedIn(org, "energy_manager");
    reportId = await requestMarchReport(org, manager);
    pdf = await download(org, await signedIn(org, "auditor"), reportId);
  }, 120_000);

  it("stores the report with the SHA-256 of the bytes it serves", async () => {
    const { createHash } = await import("node:crypto");
    const [row] = await db
      .select()
      .from(schema.reports)
      .where(eq(schema.reports.id, reportId));
    expect(row.sha256).toBe(createHash("sha256").update(pdf).digest("hex"));
    expect(row.byteSize).toBe(pdf.length);
    expect(row.progress).toBe(100);
    expect(row.pageCount).toBeGreaterThan(1);
  });

  it("e-mails the person who asked once the report is stored", async () => {
    // Sent just after the row is stored: give it a moment.
    let message = await latestEmailTo(org.org.members[1].email);
    for (let i = 0; !message && i < 40; i++) {
      await new Promise((r) => setTimeout(r, 100));
      message = await latestEmailTo(org.org.members[1].email);
    }
    expect(message?.subject).toBe(`Report ready: ${org.org.name} · March 2026`);
    const { createHash } = await import("node:crypto");
    expect(message?.text).toContain(
      createHash("sha256").update(pdf).digest("hex"),
    );
    expect(message?.text).toContain("provisional");
    expect(message?.text).toContain(`/o/${org.org.id}/reports`);
  });

  it("pdfsig reports the signature valid and the whole document signed", async () => {
    const out = await pdfsig(pdf);
    expect(out).toMatch(/Signature Validation: Signature is Valid\./);
    expect(out).toContain("Total document signed");
  });

  it("pdfsig reports a digest mismatch after one changed byte", async () => {
    const out = await pdfsig(tampered(pdf));
    expect(out).toMatch(/Signature Validation: Digest Mismatch\./);
  });

  it("pdftotext finds the site name; pdftoppm renders page 1", async () => {
    const dir = await mkdtemp(join(tmpdir(), "jb-report-"));
    const file = join(dir, "report.pdf");
    await writeFile(file, pdf);
    const { stdout } = await run("pdftotext", ["-layout", file, "-"]);
    const [site] = await db
      .select({ name: schema.sites.name })
      .from(schema.sites)
      .where(eq(schema.sites.id, org.siteId));
    expect(stdout).toContain(site.name);
    expect(stdout).toContain(org.org.name);
    await run("pdftoppm", [
      "-png",
      "-r",
      "40",
      "-f",
      "1",
      "-l",
      "1",
      file,
      join(dir, "p"),
    ]);
    const { stdout: listing } = await run("ls", [dir]);
    expect(listing).toMatch(/p-0?1\.png/);
  });

  it("Verify says which report a genuine copy is, when and by whom", async () => {
    const { status, html } = await verify(
      org,
      await signedIn(org, "auditor"),
      pdf,
    );
    expect(status).toBe(200);
    expect(html).toContain('data-verdict="genuine"');
    expect(html).toContain("Genuine and unaltered");
    expect(html).toContain(org.org.members[1].email);
  });

  it("Verify refuses a tampered copy and says why", async () => {
    const { html } = await verify(
      org,
      await signedIn(org, "owner"),
      tampered(pdf),
    );
    expect(html).toContain('data-verdict="invalid"');
    expect(html).toMatch(/digest mismatch/i);
  });

  it("Verify refuses a truncated copy and bytes appended after signing", async () => {
    const auditor = await signedIn(org, "auditor");
    const cut = await verify(org, auditor, pdf.subarray(0, pdf.length - 200));
    expect(cut.html).toContain('data-verdict="invalid"');
    const grown = await verify(
      org,
      auditor,
      Buffer.concat([pdf, Buffer.from("\n% appended\n")]),
    );
    expect(grown.html).toContain('data-verdict="invalid"');
    expect(grown.html).toMatch(/whole/i);
  });

  it("Verify refuses a foreign PDF: unsigned, or another organisation's report", async () => {
    const auditor = await signedIn(org, "auditor");
    const plain = await verify(org, auditor, await unsignedPdf());
    expect(plain.html).toContain('data-verdict="invalid"');
    expect(plain.html).toMatch(/no signature/i);

    const other = await createMeteredOrg({ roles: [...ROLES] });
    await postMarchReadings(other);
    const otherId = await requestMarchReport(
      other,
      await signedIn(other, "owner"),
    );
    const otherPdf = await download(
      other,
      await signedIn(other, "owner"),
      otherId,
    );
    const foreign = await verify(org, auditor, otherPdf);
    expect(foreign.html).toContain('data-verdict="not_issued_here"');
  });

  it("roles: finance and auditors download but cannot make reports; finance and managers cannot verify", async () => {
    for (const role of ["finance", "auditor"] as const) {
      const client = await signedIn(org, role);
      const made = await client.post(`/o/${org.org.id}/reports`, {
        scope: "all",
        period: "month:2026-03",
      });
      expect(made.status).toBe(403);
      expect(
        (await client.get(`/o/${org.org.id}/reports/${reportId}/pdf`)).status,
      ).toBe(200);
    }
    for (const role of ["finance", "energy_manager"] as const) {
      const client = await signedIn(org, role);
      expect((await client.get(`/o/${org.org.id}/reports/verify`)).status).toBe(
        403,
      );
      // A small upload: a refused request's body is never read, and a large
      // unread body makes the server close the connection under the client.
      const probe = Buffer.from("%PDF-1.7\n%%EOF\n");
      expect((await verify(org, client, probe)).status).toBe(403);
    }
  });

  it("another organisation's members get 404 for its reports", async () => {
    const other = await createMeteredOrg({ roles: ["owner"] });
    const outsider = await signedIn(other, "owner");
    expect((await outsider.get(`/o/${org.org.id}/reports`)).status).toBe(404);
    expect(
      (await outsider.get(`/o/${org.org.id}/reports/${reportId}/pdf`)).status,
    ).toBe(404);
    // Its own organisation does not have the report either.
    expect(
      (await outsider.get(`/o/${other.org.id}/reports/${reportId}/pdf`)).status,
    ).toBe(404);
  });

  it("bad requests change nothing", async () => {
    const manager = await signedIn(org, "energy_manager");
    const before = await db
      .select({ id: schema.reports.id })
      .from(schema.reports)
      .where(eq(schema.reports.organizationId, org.org.id));
    const attempts: Record<string, string>[] = [
      { scope: "all", period: "month:2026-13" },
      { scope: "all", period: "decade:2020" },
      { scope: "not-a-site", period: "month:2026-03" },
      { scope: "all" },
      {
        scope: "00000000-0000-4000-8000-000000000000",
        period: "month:2026-03",
      },
    ];
    for (const fields of attempts) {
      const response = await manager.post(`/o/${org.org.id}/reports`, fields);
      expect(response.status).toBe(400);
    }
    const after = await db
      .select({ id: schema.reports.id })
      .from(schema.reports)
      .where(eq(schema.reports.organizationId, org.org.id));
    expect(after.length).toBe(before.length);
  });

  it("the JSON API lists, makes, serves and verifies reports, with the same role checks", async () => {
    const api = `/api/v1/orgs/${org.org.id}/reports`;
    const auditor = await signedIn(org, "auditor");
    const listed = await auditor.get(api);
    expect(listed.status).toBe(200);
    const { reports } = (await listed.json()) as {
      reports: { id: string; sha256: string; status: string }[];
    };
    const mine = reports.find((r) => r.id === reportId)!;
    expect(mine.status).toBe("done");
    expect(mine).not.toHaveProperty("pdf");

    const file = await auditor.get(`${api}/${reportId}/pdf`);
    expect(file.headers.get("x-content-sha256")).toBe(mine.sha256);
    expect(Buffer.from(await file.arrayBuffer()).equals(pdf)).toBe(true);

    const check = (client: Client, body: Buffer) =>
      client.request(`${api}/verify`, {
        method: "POST",
        headers: { "content-type": "application/pdf" },
        body: new Uint8Array(body),
      });
    const genuine = await check(auditor, pdf);
    expect(await genuine.json()).toMatchObject({
      verdict: "genuine",
      sha256: mine.sha256,
      report: { id: reportId },
    });
    const altered = await check(auditor, tampered(pdf));
    expect(await altered.json()).toMatchObject({
      verdict: "invalid",
      reason: "digest_mismatch",
    });

    // Auditors may not make reports; managers may, and get 202 at once.
    const refused = await auditor.postJson(api, {
      scope: "all",
      period: "month:2026-03",
    });
    expect(refused.status).toBe(403);
    const manager = await signedIn(org, "energy_manager");
    const bad = await manager.postJson(api, { scope: "all", period: "year:1" });
    expect(bad.status).toBe(400);
    const made = await manager.postJson(api, {
      scope: org.siteId,
      period: "quarter:2026-Q1",
    });
    expect(made.status).toBe(202);
    const { id } = (await made.json()) as { id: string };
    await waitForReport(org.org.id, id);
    expect((await check(manager, pdf)).status).toBe(403);

    // Another organisation's member sees none of it.
    const other = await createMeteredOrg({ roles: ["owner"] });
    const outsider = await signedIn(other, "owner");
    expect((await outsider.get(api)).status).toBe(404);
    expect((await outsider.get(`${api}/${reportId}/pdf`)).status).toBe(404);
  });

  it("the signing CA certificate can be downloaded", async () => {
    const response = await new Client().get("/signing-ca.pem");
    expect(response.status).toBe(200);
    expect(await response.text()).toContain("-----BEGIN CERTIFICATE-----");
  });
});
