import { type ChildProcess, spawn } from "node:child_process";

// Starting and stopping the child processes of the local stack, each in its own process group
// so that stopping it also stops whatever it started.

/**
 * Node's "react-server" export condition for scripts (seed, worker) that import the app's
 * server modules: their `import "server-only"` guard then resolves to its empty module, as it
 * does inside Next's server bundle.
 */
export const SERVER_CONDITION = "--conditions=react-server";

export interface Child {
  name: string;
  process: ChildProcess;
  stop(): Promise<void>;
}

export function startChild(
  name: string,
  command: string,
  args: string[],
  options: { env?: Record<string, string>; quiet?: boolean } = {},
): Child {
  const child = spawn(command, args, {
    env: { ...process.env, ...options.env },
    stdio: options.quiet ? ["ignore", "ignore", "pipe"] : ["ignore", "pipe", "pipe"],
    detached: true,
  });
  const prefix = `[${name}] `;
  const forward = (stream: NodeJS.WritableStream) => (chunk: Buffer) => {
    for (const line of chunk.toString().split("\n")) if (line.trim()) stream.write(prefix + line + "\n");
  };
  child.stdout?.on("data", forward(process.stdout));
  child.stderr?.on("data", forward(process.stderr));
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  return {
    name,
    process: child,
    async stop() {
      if (child.exitCode !== null || child.signalCode !== null || !child.pid) return;
      try {
        process.kill(-child.pid, "SIGTERM");
      } catch {
        return;
      }
      const timeout = new Promise<"timeout">((r) => setTimeout(() => r("timeout"), 5000));
      if ((await Promise.race([exited, timeout])) === "timeout") {
        try {
          process.kill(-child.pid, "SIGKILL");
        } catch {
          /* already gone */
        }
      }
    },
  };
}

/** Waits until a URL answers (any status below 500), or throws after the timeout. */
export async function waitForHttp(url: string, timeoutMs = 60_000, child?: Child): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child && child.process.exitCode !== null) {
      throw new Error(`${child.name} exited with code ${child.process.exitCode} before ${url} answered.`);
    }
    try {
      const res = await fetch(url, { redirect: "manual" });
      if (res.status < 500) return;
    } catch {
      /* not up yet */
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s.`);
}

/** Runs a command to completion, failing with its exit code. */
export function runToEnd(command: string, args: string[], env?: Record<string, string>): Promise<void> {
  return new Promise((resolve, reject) => {
    const child = spawn(command, args, { env: { ...process.env, ...env }, stdio: "inherit" });
    child.once("error", reject);
    child.once("exit", (code) =>
      code === 0 ? resolve() : reject(new Error(`${command} ${args.join(" ")} exited with code ${code}`)),
    );
  });
}
