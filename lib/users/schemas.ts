import { z } from "zod";
import { passwordSchema } from "@/lib/auth/password-rules";
import { ROLES } from "@/lib/auth/roles";
import { listQuerySchema } from "@/lib/http/paging";

// Input shapes shared by the forms (zodResolver) and the server, which parses them again.

export const emailSchema = z
  .string()
  .trim()
  .min(1, "Enter an e-mail address.")
  .max(254, "An e-mail address has at most 254 characters.")
  .pipe(z.email("Enter a valid e-mail address, like name@clinic.example."))
  .transform((e) => e.toLowerCase());

export const personNameSchema = z
  .string()
  .trim()
  .min(1, "Enter the person's name.")
  .max(120, "Use at most 120 characters.")
  .refine((n) => !/[\u0000-\u001f<>]/.test(n), "Names cannot contain control characters or angle brackets.");

export const inviteUserSchema = z.object({
  name: personNameSchema,
  email: emailSchema,
  role: z.enum(ROLES, { error: "Choose one of the listed roles." }),
  organisationId: z.coerce.number().int().positive("Choose an organisation."),
  siteId: z.preprocess(
    (v) => (v === "" || v === undefined ? null : v),
    z.coerce.number().int().positive("Choose a site.").nullable(),
  ),
});
export type InviteUserInput = z.input<typeof inviteUserSchema>;

export const userStatusSchema = z.object({
  userId: z.coerce.number().int().positive(),
  status: z.enum(["active", "disabled"]),
});

export const resendInvitationSchema = z.object({ userId: z.coerce.number().int().positive() });

export const acceptInvitationSchema = z
  .object({
    token: z.string().min(20).max(200),
    password: passwordSchema,
    confirm: z.string(),
  })
  .refine((v) => v.password === v.confirm, { path: ["confirm"], message: "The two passwords differ." });
export type AcceptInvitationInput = z.input<typeof acceptInvitationSchema>;

export const listUsersQuerySchema = listQuerySchema(["name", "email", "role", "status", "organisation", "last_sign_in_at"], {
  role: z.enum(ROLES).optional(),
  status: z.enum(["invited", "active", "disabled"]).optional(),
  organisationId: z.coerce.number().int().positive().optional(),
});
export type ListUsersQuery = z.infer<typeof listUsersQuerySchema>;
