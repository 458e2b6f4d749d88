import { fileURLToPath } from "node:url";
import { Worker } from "node:worker_threads";
import { RoutingInputError } from "./errors";
import type { GreatCircleOptions } from "./geo";
import type { SolveOptions } from "./solver";
import type { Problem, Solution } from "./types";

// Runs `solve` in a worker thread (solve-worker.ts) and resolves with its solution. The search
// is pure computation: on the server's own thread it would stall every other request for its
// whole time budget. Problem, options and solution cross the thread boundary as structured
// clones, so the travel model is sent as its settings (great-circle distance only).

export interface WorkerRequest {
  problem: Problem;
  travel: GreatCircleOptions;
  options: SolveOptions;
}

/** The solution, or the input's problems (a RoutingInputError), or another failure's message. */
export type WorkerReply = { ok: true; solution: Solution } | { ok: false; issues: readonly string[] } | { ok: false; message: string };

/**
 * The worker. Inside Next.js (which sets NEXT_RUNTIME) the bundler builds solve-worker.ts as a
 * worker-thread chunk of its own and rewrites this URL to it; outside a bundle (tests, scripts
 * run with tsx) the entry is TypeScript, so a small bootstrap registers tsx's loader in the new
 * thread and then loads it.
 */
function startWorker(workerData: WorkerRequest): Worker {
  if (process.env.NEXT_RUNTIME) return new Worker(new URL("./solve-worker.ts", import.meta.url), { workerData });
  const entry = fileURLToPath(import.meta.url).replace(/solve-in-worker\.ts$/, "solve-worker.ts");
  const bootstrap = `require("tsx/cjs/api").register(); require(${JSON.stringify(entry)});`;
  return new Worker(bootstrap, { eval: true, workerData });
}

export function solveInWorker(problem: Problem, travel: GreatCircleOptions, options: SolveOptions): Promise<Solution> {
  return new Promise((resolve, reject) => {
    const worker = startWorker({ problem, travel, options });
    let settled = false;
    const settle = (fn: () => void) => {
      if (settled) return;
      settled = true;
      fn();
      void worker.terminate();
    };
    worker.once("message", (reply: WorkerReply) =>
      settle(() => {
        if (reply.ok) resolve(reply.solution);
        else if ("issues" in reply) reject(new RoutingInputError(reply.issues));
        else reject(new Error(`The route planner failed: ${reply.message}`));
      }),
    );
    worker.once("error", (error) => settle(() => reject(error)));
    worker.once("exit", (code) => settle(() => reject(new Error(`The route planner stopped (exit code ${code}) before it answered.`))));
  });
}
