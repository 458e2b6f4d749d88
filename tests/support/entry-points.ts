import fs from "node:fs";
import path from "node:path";

// Every entry point of the app as the code defines it: route handler modules under app/api and
// every "use server" module. Tests walk these instead of keeping a list by hand.

const ROOT = path.resolve(__dirname, "../..");
export const HTTP_METHODS = ["GET", "HEAD", "POST", "PUT", "PATCH", "DELETE", "OPTIONS"] as const;

function walk(dir: string, keep: (file: string) => boolean, out: string[] = []): string[] {
  for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) {
      if (entry.name !== "node_modules" && !entry.name.startsWith(".")) walk(full, keep, out);
    } else if (keep(full)) out.push(full);
  }
  return out;
}

export interface RouteModule {
  /** The URL path pattern, e.g. `/api/orders/[id]`. */
  route: string;
  file: string;
  /** The dynamic segments in order, e.g. `["id"]`. */
  params: string[];
}

/** Every `app/api/**\/route.ts`, sorted by its URL path. */
export function routeModules(): RouteModule[] {
  return walk(path.join(ROOT, "app/api"), (f) => path.basename(f) === "route.ts")
    .map((file) => {
      const route = "/" + path.relative(path.join(ROOT, "app"), path.dirname(file)).split(path.sep).join("/");
      const params = [...route.matchAll(/\[(?:\.\.\.)?([A-Za-z]+)\]/g)].map((m) => m[1]!);
      return { route, file, params };
    })
    .sort((a, b) => a.route.localeCompare(b.route));
}

/** Every module marked "use server" under app/, lib/ and components/, relative to the project. */
export function serverActionModules(): string[] {
  const isServerModule = (f: string) => {
    if (!/\.(ts|tsx)$/.test(f)) return false;
    const head = fs.readFileSync(f, "utf8").replace(/^(\s*(\/\/[^\n]*|\/\*[\s\S]*?\*\/))*\s*/, "");
    return /^["']use server["']/.test(head);
  };
  return ["app", "lib", "components"]
    .flatMap((dir) => walk(path.join(ROOT, dir), isServerModule))
    .map((f) => path.relative(ROOT, f).split(path.sep).join("/"))
    .sort();
}

export function absolute(relative: string): string {
  return path.join(ROOT, relative);
}
