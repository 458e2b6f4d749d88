"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
import { UserPlus } from "lucide-react";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
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
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const queryClient = useQueryClient();
  const first = options[0];
  const {
    register,
    handleSubmit,
    watch,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormInput, unknown, FormOutput>({
    resolver: zodResolver(inviteUserSchema),
    defaultValues: { name: "", email: "", organisationId: first?.id, role: first?.roles[0], siteId: "" },
  });
  const organisationId = Number(watch("organisationId"));
  const role = watch("role");
  const org = options.find((o) => o.id === organisationId) ?? first;

  const onSubmit = async (values: FormOutput) => {
    setFormError(null);
    const result = await inviteUserAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(`Invitation sent to ${values.email}`);
    await queryClient.invalidateQueries({ queryKey: ["users"] });
    reset();
    setOpen(false);
  };

  if (!first) return null;
  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>
        <Button>
          <UserPlus className="h-4 w-4" aria-hidden="true" />
          Invite someone
        </Button>
      </DialogTrigger>
      <DialogContent title="Invite someone" description="They receive an e-mail with a link to choose a password. The link works once, for 72 hours.">
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
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
            <div className="flex justify-end gap-2 pt-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit">{isSubmitting ? "Sending…" : "Send invitation"}</Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
