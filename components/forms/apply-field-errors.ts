import type { FieldValues, Path, UseFormSetError } from "react-hook-form";
import type { FieldErrors } from "@/lib/errors";

/** Puts the server's field errors under the matching form fields. */
export function applyFieldErrors<T extends FieldValues>(fields: FieldErrors | undefined, setError: UseFormSetError<T>) {
  for (const [name, messages] of Object.entries(fields ?? {})) {
    if (name && messages[0]) setError(name as Path<T>, { type: "server", message: messages[0] });
  }
}
