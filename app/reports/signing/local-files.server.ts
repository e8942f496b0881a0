/**
 * The local signing identity on disk, created once:
 *
 *   ca.pem               the CA certificate (public; the download route serves it)
 *   ca.key.pem           the CA private key (0600; not needed to sign, may be moved offline)
 *   signer.p12.password  the PKCS#12 password (0600)
 *   signer.p12           signer key + certificate + CA certificate (0600)
 *
 * Each file is written to a temporary name and renamed, and signer.p12 comes
 * last: while it is absent no report can have been signed, so an interrupted
 * run is simply redone. A lock folder keeps two processes from interleaving.
 */
import { randomBytes } from "node:crypto";
import { existsSync } from "node:fs";
import { mkdir, open, readdir, rename, rm, stat } from "node:fs/promises";
import path from "node:path";
import { setTimeout as sleep } from "node:timers/promises";
import { createLocalSigningIdentity } from "./local-ca.server";

export interface LocalIdentityFiles {
  dir: string;
  caPem: string;
  caKey: string;
  p12: string;
  p12Password: string;
}

export function signingFilePaths(dir: string): LocalIdentityFiles {
  const abs = path.resolve(dir);
  return {
    dir: abs,
    caPem: path.join(abs, "ca.pem"),
    caKey: path.join(abs, "ca.key.pem"),
    p12: path.join(abs, "signer.p12"),
    p12Password: path.join(abs, "signer.p12.password"),
  };
}

/** A lock older than this belongs to a process that died mid-way. */
const STALE_LOCK_MS = 2 * 60_000;
const LOCK_POLL_MS = 100;

export async function ensureLocalSigningIdentity(
  dir: string,
): Promise<LocalIdentityFiles & { created: boolean }> {
  const files = signingFilePaths(dir);
  if (isComplete(files)) return { ...files, created: false };
  await mkdir(files.dir, { recursive: true, mode: 0o700 });
  const lock = path.join(files.dir, ".creating");
  await acquireLock(lock);
  try {
    // Another process may have finished while this one waited.
    if (isComplete(files)) return { ...files, created: false };
    await writeIdentity(files);
    return { ...files, created: true };
  } finally {
    await rm(lock, { recursive: true, force: true });
  }
}

function isComplete(files: LocalIdentityFiles): boolean {
  if (!existsSync(files.p12)) return false;
  if (!existsSync(files.p12Password))
    throw new Error(
      `${files.p12} exists but ${files.p12Password} is missing; restore it or move the folder aside to create a new identity.`,
    );
  return true;
}

async function writeIdentity(files: LocalIdentityFiles): Promise<void> {
  await removeLeftovers(files.dir);
  const identity = createLocalSigningIdentity();
  await writeAtomic(files.caKey, identity.caPrivateKeyPem, 0o600);
  await writeAtomic(files.caPem, identity.caCertificatePem, 0o644);
  await writeAtomic(files.p12Password, `${identity.p12Password}\n`, 0o600);
  await writeAtomic(files.p12, identity.p12, 0o600);
}

/** Temporary files of a run that was interrupted before its rename. */
async function removeLeftovers(dir: string): Promise<void> {
  for (const name of await readdir(dir))
    if (name.endsWith(".tmp")) await rm(path.join(dir, name), { force: true });
}

async function writeAtomic(
  file: string,
  data: string | Buffer,
  mode: number,
): Promise<void> {
  const temp = `${file}.${randomBytes(6).toString("hex")}.tmp`;
  const handle = await open(temp, "wx", mode);
  try {
    await handle.writeFile(data);
    await handle.sync();
  } finally {
    await handle.close();
  }
  await rename(temp, file);
}

async function acquireLock(lock: string): Promise<void> {
  for (;;) {
    try {
      await mkdir(lock);
      return;
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code !== "EEXIST") throw error;
    }
    const age = await stat(lock).then(
      (s) => Date.now() - s.mtimeMs,
      () => 0,
    );
    if (age > STALE_LOCK_MS) await rm(lock, { recursive: true, force: true });
    else await sleep(LOCK_POLL_MS);
  }
}
