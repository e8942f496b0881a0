/**
 * Runs functions of scripts/lib.sh (the shell behind npm start and npm test)
 * in a bash of their own, with the environment a test gives.
 */
import { spawn, type ChildProcess } from "node:child_process";
import { fileURLToPath } from "node:url";

const LIB_SH = fileURLToPath(new URL("../../scripts/lib.sh", import.meta.url));

export interface ShellResult {
  code: number | null;
  stdout: string;
  stderr: string;
}

export interface RunningShell {
  child: ChildProcess;
  /** Everything written so far. */
  output(): ShellResult;
  /** Resolves with the first stdout line matching, or rejects when bash ends first. */
  line(pattern: RegExp): Promise<RegExpMatchArray>;
  /** Resolves once bash has ended and its output is closed. */
  exited: Promise<ShellResult>;
  /** Resolves once bash itself has ended (children may still hold its output). */
  died: Promise<void>;
}

/** `source scripts/lib.sh` then `body`, in bash; stdin stays open. */
export function startLibSh(
  body: string,
  env: Record<string, string | undefined>,
): RunningShell {
  const child = spawn("bash", ["-c", `source "${LIB_SH}"\n${body}`], {
    env: { ...process.env, ...env },
    stdio: ["pipe", "pipe", "pipe"],
  });
  let stdout = "";
  let stderr = "";
  child.stdout.setEncoding("utf8").on("data", (chunk: string) => {
    stdout += chunk;
  });
  child.stderr.setEncoding("utf8").on("data", (chunk: string) => {
    stderr += chunk;
  });
  const output = () => ({ code: child.exitCode, stdout, stderr });
  const exited = new Promise<ShellResult>((resolve) =>
    child.once("close", (code) => resolve({ code, stdout, stderr })),
  );
  const died = new Promise<void>((resolve) =>
    child.once("exit", () => resolve()),
  );
  const line = (pattern: RegExp) =>
    new Promise<RegExpMatchArray>((resolve, reject) => {
      const check = () => {
        const match = stdout.match(pattern);
        if (!match) return false;
        child.stdout.off("data", check);
        resolve(match);
        return true;
      };
      if (check()) return;
      child.stdout.on("data", check);
      void exited.then((result) => {
        if (!check())
          reject(
            new Error(
              `bash ended (${result.code}) before printing ${pattern}:\n${result.stdout}\n${result.stderr}`,
            ),
          );
      });
    });
  return { child, output, line, exited, died };
}

/** Runs `body` to its end with stdin closed. */
export function runLibSh(
  body: string,
  env: Record<string, string | undefined>,
): Promise<ShellResult> {
  const shell = startLibSh(body, env);
  shell.child.stdin?.end();
  return shell.exited;
}
