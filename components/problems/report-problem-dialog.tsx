"use client";

import { useQueryClient } from "@tanstack/react-query";
import { AlertTriangle, Camera, MessageSquareWarning } from "lucide-react";
import Image from "next/image";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { useWatch } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Select, Textarea } from "@/components/ui/input";
import { fetchJson } from "@/lib/fetch-json";
import { reportProblemAction } from "@/lib/problems/actions";
import { DESCRIPTION_MAX, needsDeliveredSet, PROBLEM_KIND_LABELS, PROBLEM_KINDS, reportProblemSchema } from "@/lib/problems/schemas";

type FormInput = z.input<typeof reportProblemSchema>;
type FormOutput = z.output<typeof reportProblemSchema>;

export interface ReportableSet {
  cycleId: number;
  /** "QMH-000012 — Major laparotomy tray" */
  label: string;
  delivered: boolean;
  stateLabel: string;
}

/** Report a problem with a delivered set of an order (or with the order as a whole), with an optional photo. */
export function ReportProblemDialog({ orderId, reference, sets }: { orderId: number; reference: string; sets: ReportableSet[] }) {
  const [photo, setPhoto] = useState<{ id: number; name: string } | null>(null);
  const [uploading, setUploading] = useState(false);
  const [uploadError, setUploadError] = useState<string | null>(null);
  const router = useRouter();
  const queryClient = useQueryClient();
  const uid = useId();
  const id = (name: string) => `${uid}-${name}`;
  const anyDelivered = sets.some((s) => s.delivered);
  const dialog = useFormDialog({
    schema: reportProblemSchema,
    defaults: (): FormInput => ({
      orderId,
      kind: anyDelivered ? "damaged_instrument" : "other",
      cycleId: sets.find((s) => s.delivered)?.cycleId ?? "",
      description: "",
      photoFileId: null,
    }),
    resetOnOpen: true,
    onOpen: () => {
      setPhoto(null);
      setUploadError(null);
    },
    submit: (_values, parsed: FormOutput) => reportProblemAction(parsed),
    onSuccess: async ({ problemId }) => {
      toast.success(`Problem ${problemId} reported to the unit`);
      await queryClient.invalidateQueries({ queryKey: ["problems"] });
      router.refresh();
    },
  });
  const {
    register,
    control,
    setValue,
    clearErrors,
    formState: { errors },
  } = dialog.form;
  const kind = useWatch({ control, name: "kind" }) as FormOutput["kind"];
  const description = useWatch({ control, name: "description" }) ?? "";
  const setBound = needsDeliveredSet(kind);

  const uploadPhoto = async (file: File | undefined) => {
    if (!file) return;
    setUploadError(null);
    clearErrors("photoFileId");
    setUploading(true);
    try {
      const body = new FormData();
      body.set("file", file);
      body.set("purpose", "problem_photo");
      const saved = await fetchJson<{ id: number; name: string }>("/api/files", { method: "POST", body });
      setValue("photoFileId", saved.id, { shouldDirty: true });
      setPhoto({ id: saved.id, name: saved.name });
    } catch (error) {
      setUploadError(error instanceof Error ? error.message : "The upload did not work. Try again.");
    } finally {
      setUploading(false);
    }
  };

  const photoError = uploadError ?? errors.photoFileId?.message;
  return (
    <FormDialog
      dialog={dialog}
      trigger={
        <Button variant="secondary">
          <MessageSquareWarning className="h-4 w-4" aria-hidden="true" />
          Report a problem
        </Button>
      }
      title={`Report a problem with ${reference}`}
      description="The unit sees it at once and answers in writing; you get the answer by e-mail and on this page."
      submitLabel="Send to the unit"
      submittingLabel="Sending…"
      submitDisabled={uploading}
    >
      <input type="hidden" {...register("orderId")} />
      <Field id={id("kind")} label="What is wrong?" error={errors.kind?.message}>
        <Select id={id("kind")} aria-invalid={!!errors.kind} {...register("kind")}>
          {PROBLEM_KINDS.map((k) => (
            <option key={k} value={k} disabled={needsDeliveredSet(k) && !anyDelivered}>
              {PROBLEM_KIND_LABELS[k]}
              {needsDeliveredSet(k) && !anyDelivered ? " (once a set is delivered)" : ""}
            </option>
          ))}
        </Select>
      </Field>
      {kind === "wet_or_torn_pack" && (
        <p className="flex gap-2 rounded-lg bg-warn-50 px-3 py-2 text-sm text-warn-700" data-testid="pack-warning">
          <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
          Do not use a set whose pack is wet, torn or open: keep it aside, unopened, until the unit answers. Your own procedures and
          infection-prevention staff have the last word.
        </p>
      )}
      <Field
        id={id("set")}
        label={setBound ? "Which set?" : "Which set? (optional)"}
        hint={setBound ? "Only sets that were delivered to you can be chosen." : "Leave it on the whole order if it is not about one set."}
        error={errors.cycleId?.message}
      >
        <Select id={id("set")} aria-invalid={!!errors.cycleId} {...register("cycleId")}>
          <option value="">{setBound ? "Choose a set" : "The order as a whole"}</option>
          {sets.map((s) => (
            <option key={s.cycleId} value={s.cycleId} disabled={setBound && !s.delivered}>
              {s.label}
              {s.delivered ? "" : ` (${s.stateLabel.toLowerCase()})`}
            </option>
          ))}
        </Select>
      </Field>
      <Field
        id={id("description")}
        label="What did you find?"
        hint={`Which instrument, where in the set, how many; at least 10 characters. ${description.length}/${DESCRIPTION_MAX}`}
        error={errors.description?.message}
      >
        <Textarea id={id("description")} rows={5} maxLength={DESCRIPTION_MAX + 200} aria-invalid={!!errors.description} {...register("description")} />
      </Field>

      <div className="space-y-2">
        <p className="text-sm font-medium text-ink" id={id("photo-label")}>
          Photo (optional)
        </p>
        {photo && (
          <div className="flex flex-wrap items-center gap-3 rounded-lg border border-line p-2 text-sm">
            <Image src={`/api/files/${photo.id}`} alt="The photo you attached" width={96} height={72} unoptimized className="h-16 w-auto rounded border border-line object-cover" />
            <span className="min-w-0 flex-1 truncate" data-testid="photo-name">
              {photo.name}
            </span>
            <Button
              variant="ghost"
              size="sm"
              onClick={() => {
                setValue("photoFileId", null, { shouldDirty: true });
                setPhoto(null);
              }}
            >
              Remove
            </Button>
          </div>
        )}
        <label
          htmlFor={id("photo")}
          className="inline-flex cursor-pointer items-center gap-2 rounded-lg border border-line-strong px-3 py-2 text-sm font-medium text-ink focus-within:ring-2 focus-within:ring-lagoon-200 hover:bg-paper"
        >
          <Camera className="h-4 w-4" aria-hidden="true" />
          {uploading ? "Uploading…" : photo ? "Replace the photo" : "Add a photo"}
          <input
            id={id("photo")}
            type="file"
            accept="image/png,image/jpeg"
            className="sr-only"
            aria-labelledby={id("photo-label")}
            aria-describedby={photoError ? id("photo-error") : undefined}
            onChange={(e) => {
              void uploadPhoto(e.target.files?.[0]);
              e.target.value = "";
            }}
          />
        </label>
        <p className="text-xs text-muted">A PNG or JPEG image of at most 10 MB.</p>
        {photoError && (
          <p id={id("photo-error")} role="alert" className="text-xs font-medium text-danger-700">
            {photoError}
          </p>
        )}
      </div>
    </FormDialog>
  );
}
