/**
 * A local stand-in for the Resend e-mail API: the part the `resend` SDK uses
 * (POST /emails, POST /emails/batch, GET /emails[/:id]) plus a JSON view and a
 * reset for tests. Messages are kept in memory and, when OUTBOX_FILE is set,
 * in a JSON file so that a restart of `npm start` keeps the demo outbox.
 *
 * Run alone: `node --import tsx fakes/resend-fake.ts`, on RESEND_FAKE_PORT or
 * a free port (it prints which); see fakes/listen-as-script.ts.
 */
import { randomUUID } from "node:crypto";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import type { Server } from "node:http";
import type { AddressInfo } from "node:net";
import express, { type Express, type Request, type Response } from "express";
import { z } from "zod";
import { exitOnFailure, listenAsScript } from "./listen-as-script";

const addressList = z.union([
  z.string().min(3).max(320),
  z.array(z.string().min(3).max(320)).min(1).max(50),
]);

const emailSchema = z
  .object({
    from: z.string().min(3).max(320),
    to: addressList,
    subject: z.string().min(1).max(998),
    html: z.string().max(1_000_000).optional(),
    text: z.string().max(1_000_000).optional(),
    reply_to: addressList.optional(),
    cc: addressList.optional(),
    bcc: addressList.optional(),
    headers: z.record(z.string(), z.string()).optional(),
    // The real service allows ASCII letters, digits, _ and - in tags.
    tags: z
      .array(
        z.object({
          name: z.string().regex(/^[\w-]{1,256}$/),
          value: z.string().regex(/^[\w-]{1,256}$/),
        }),
      )
      .optional(),
  })
  .refine((m) => m.html !== undefined || m.text !== undefined, {
    message: "Either html or text is required",
  });

export interface StoredEmail {
  id: string;
  object: "email";
  created_at: string;
  from: string;
  to: string[];
  subject: string;
  html: string | null;
  text: string | null;
  tags: { name: string; value: string }[];
  last_event: "delivered";
}

function loadOutbox(file: string | undefined): StoredEmail[] {
  if (!file || !existsSync(file)) return [];
  try {
    return JSON.parse(readFileSync(file, "utf8")) as StoredEmail[];
  } catch {
    return [];
  }
}

function errorBody(
  res: Response,
  statusCode: number,
  name: string,
  message: string,
) {
  res.status(statusCode).json({ statusCode, name, message });
}

export function createResendFake(options: { outboxFile?: string } = {}) {
  const outbox = loadOutbox(options.outboxFile);
  const persist = () => {
    if (options.outboxFile)
      writeFileSync(options.outboxFile, JSON.stringify(outbox));
  };

  function store(message: z.infer<typeof emailSchema>): StoredEmail {
    const email: StoredEmail = {
      id: randomUUID(),
      object: "email",
      created_at: new Date().toISOString(),
      from: message.from,
      to: Array.isArray(message.to) ? message.to : [message.to],
      subject: message.subject,
      html: message.html ?? null,
      text: message.text ?? null,
      tags: message.tags ?? [],
      last_event: "delivered",
    };
    outbox.push(email);
    return email;
  }

  const app = express();
  app.use(express.json({ limit: "2mb" }));

  // The real service refuses requests without an API key; so does the fake.
  app.use((req: Request, res: Response, next) => {
    if (
      req.method === "POST" &&
      !/^Bearer \S+/.test(req.get("authorization") ?? "")
    ) {
      return errorBody(
        res,
        401,
        "missing_api_key",
        "Missing API key in the authorization header",
      );
    }
    next();
  });

  app.post("/emails", (req, res) => {
    const parsed = emailSchema.safeParse(req.body);
    if (!parsed.success) {
      return errorBody(
        res,
        422,
        "validation_error",
        z.prettifyError(parsed.error),
      );
    }
    const email = store(parsed.data);
    persist();
    res.json({ id: email.id });
  });

  app.post("/emails/batch", (req, res) => {
    const parsed = z.array(emailSchema).min(1).max(100).safeParse(req.body);
    if (!parsed.success) {
      return errorBody(
        res,
        422,
        "validation_error",
        z.prettifyError(parsed.error),
      );
    }
    const ids = parsed.data.map((m) => ({ id: store(m).id }));
    persist();
    res.json({ data: ids });
  });

  app.get("/emails", (_req, res) => {
    res.json({ object: "list", has_more: false, data: [...outbox].reverse() });
  });

  app.get("/emails/:id", (req, res) => {
    const email = outbox.find((m) => m.id === req.params.id);
    if (!email) return errorBody(res, 404, "not_found", "Email not found");
    res.json(email);
  });

  // Test-only reset; the real service has no such route.
  app.delete("/emails", (_req, res) => {
    outbox.length = 0;
    persist();
    res.status(204).end();
  });

  app.use((_req: Request, res: Response) =>
    errorBody(res, 404, "not_found", "Route not found"),
  );
  return app;
}

/** Listens on 127.0.0.1 (port 0: any free port) and resolves once it does. */
function listenOn(app: Express, port: number) {
  return new Promise<{ port: number; server: Server }>((resolve, reject) => {
    const server = app.listen(port, "127.0.0.1");
    server.once("error", reject);
    server.once("listening", () =>
      resolve({ port: (server.address() as AddressInfo).port, server }),
    );
  });
}

const isEntryPoint = process.argv[1]?.endsWith("resend-fake.ts");
if (isEntryPoint) {
  const app = createResendFake({ outboxFile: process.env.OUTBOX_FILE });
  exitOnFailure("resend-fake", async () => {
    const { port, server } = await listenAsScript(
      "resend-fake",
      "RESEND_FAKE_PORT",
      (wanted) => listenOn(app, wanted),
    );
    console.log(`[resend-fake] listening on http://127.0.0.1:${port}`);
    const stop = () => server.close(() => process.exit(0));
    process.on("SIGTERM", stop);
    process.on("SIGINT", stop);
  });
}
