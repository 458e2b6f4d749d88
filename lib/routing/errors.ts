// Errors raised by the route planner for input it cannot plan with.

/** Bad problem data or a travel model that cannot answer; `issues` lists each thing to fix. */
export class RoutingInputError extends Error {
  readonly issues: readonly string[];

  constructor(issues: readonly string[]) {
    super(issues.length === 1 ? issues[0] : `${issues.length} problems in the routing input:\n- ${issues.join("\n- ")}`);
    this.name = "RoutingInputError";
    this.issues = issues;
  }
}

/** A benchmark or data file that does not follow its format; the message names the line. */
export class RoutingFormatError extends Error {
  readonly line: number;

  constructor(line: number, message: string) {
    super(`line ${line}: ${message}`);
    this.name = "RoutingFormatError";
    this.line = line;
  }
}
