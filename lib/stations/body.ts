import "server-only";
import type { NextRequest } from "next/server";
import type { z } from "zod";
import { AppError } from "@/lib/errors";

/** A station request's JSON body parsed with its zod schema: 400 when it is not JSON, 422 with the fields when it does not fit. */
export async function parseJsonBody<S extends z.ZodType>(req: NextRequest, schema: S): Promise<z.infer<S>> {
  let body: unknown;
  try {
    body = await req.json();
  } catch {
    throw new AppError("invalid", "The station sent something that is not JSON. Reload the page and scan again.");
  }
  return schema.parse(body);
}
