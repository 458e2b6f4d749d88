// The worker thread's side of solveInWorker (solve-in-worker.ts): solves one problem and posts
// the solution back. It runs in its own thread so that a search of a second or more does not
// hold up the server's other requests.
import { parentPort, workerData } from "node:worker_threads";
import { RoutingInputError } from "./errors";
import { GreatCircleTravel } from "./geo";
import type { WorkerRequest, WorkerReply } from "./solve-in-worker";
import { solve } from "./solver";

const request = workerData as WorkerRequest;
let reply: WorkerReply;
try {
  reply = { ok: true, solution: solve(request.problem, new GreatCircleTravel(request.travel), request.options) };
} catch (error) {
  reply =
    error instanceof RoutingInputError
      ? { ok: false, issues: error.issues }
      : { ok: false, message: error instanceof Error ? error.message : String(error) };
}
parentPort!.postMessage(reply);
