import "server-only";
import type { NextRequest } from "next/server";
import type { z } from "zod";
import { AppError } from "@/lib/errors";

/** Parses a station request's JSON body with its schema (400 when it is not JSON, 422 with the fields when it does not fit). */
export async function readBody<S extends z.ZodType>(req: NextRequest, schema: S): Promise<z.infer<S>> {
  const body: unknown = await req.json().catch(() => {
    throw new AppError("invalid", "Send the request as JSON.");
  });
  return schema.parse(body);
}
