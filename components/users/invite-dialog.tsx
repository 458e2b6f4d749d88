"use client";

import { useQueryClient } from "@tanstack/react-query";
import { UserPlus } from "lucide-react";
import { useWatch } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { inviteUserAction } from "@/lib/users/actions";
import type { InviteOption } from "@/lib/users/assignable";
import { inviteUserSchema } from "@/lib/users/schemas";

type FormInput = z.input<typeof inviteUserSchema>;
type FormOutput = z.output<typeof inviteUserSchema>;

/** Invite a person: they get an e-mail with a one-time link to choose a password. */
export function InviteDialog({ options }: { options: InviteOption[] }) {
  const queryClient = useQueryClient();
  const first = options[0];
  const dialog = useFormDialog({
    schema: inviteUserSchema,
    defaults: (): FormInput => ({ name: "", email: "", organisationId: first?.id, role: first?.roles[0], siteId: "" }),
    submit: (_values, parsed: FormOutput) => inviteUserAction(parsed),
    onSuccess: async (_data, parsed) => {
      toast.success(`Invitation sent to ${parsed.email}`);
      await queryClient.invalidateQueries({ queryKey: ["users"] });
      dialog.form.reset();
    },
  });
  const {
    register,
    control,
    formState: { errors },
  } = dialog.form;
  const organisationId = Number(useWatch({ control, name: "organisationId" }));
  const role = useWatch({ control, name: "role" });
  const org = options.find((o) => o.id === organisationId) ?? first;

  if (!first) return null;
  return (
    <FormDialog
      dialog={dialog}
      trigger={
        <Button>
          <UserPlus className="h-4 w-4" aria-hidden="true" />
          Invite someone
        </Button>
      }
      title="Invite someone"
      description="They receive an e-mail with a link to choose a password. The link works once, for 72 hours."
      submitLabel="Send invitation"
      submittingLabel="Sending…"
    >
      <Field id="invite-name" label="Name" error={errors.name?.message}>
        <Input id="invite-name" autoComplete="off" aria-invalid={!!errors.name} {...register("name")} />
      </Field>
      <Field id="invite-email" label="E-mail" error={errors.email?.message}>
        <Input id="invite-email" type="email" autoComplete="off" aria-invalid={!!errors.email} {...register("email")} />
      </Field>
      {options.length > 1 ? (
        <Field id="invite-org" label="Organisation" error={errors.organisationId?.message}>
          <Select id="invite-org" {...register("organisationId")}>
            {options.map((o) => (
              <option key={o.id} value={o.id}>
                {o.name}
              </option>
            ))}
          </Select>
        </Field>
      ) : (
        <input type="hidden" {...register("organisationId")} />
      )}
      <Field id="invite-role" label="Role" error={errors.role?.message}>
        <Select id="invite-role" aria-invalid={!!errors.role} {...register("role")}>
          {org?.roles.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABELS[r]}
            </option>
          ))}
        </Select>
      </Field>
      {org && org.sites.length > 0 && (
        <Field
          id="invite-site"
          label={role === "clinic_staff" ? "Site" : "Site (optional)"}
          hint="Clinic staff see only their own site."
          error={errors.siteId?.message}
        >
          <Select id="invite-site" aria-invalid={!!errors.siteId} {...register("siteId")}>
            <option value="">{role === "clinic_staff" ? "Choose a site" : "Every site"}</option>
            {org.sites.map((s) => (
              <option key={s.id} value={s.id}>
                {s.name}
              </option>
            ))}
          </Select>
        </Field>
      )}
    </FormDialog>
  );
}
