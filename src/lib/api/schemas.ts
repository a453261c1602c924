import { z } from "zod";
import { roles } from "@/lib/auth/roles";

// Schemas shared by route handlers and the client (forms and fetchers are typed by the same ones).

export const idSchema = z.uuid({ message: "Not a valid id" });
export const studyParams = z.object({ studyId: idSchema });
export const siteParams = z.object({ siteId: idSchema });

export const pageQuery = z.object({
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
});

export const inviteSchema = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address").max(254),
  name: z.string().trim().min(2, "Enter the person's printed name").max(120),
  role: z.enum(roles),
  siteId: idSchema.nullable().default(null),
});
export type InviteInput = z.infer<typeof inviteSchema>;

export const grantSchema = z.object({ userId: idSchema, role: z.enum(roles), siteId: idSchema.nullable().default(null) });

export const passwordSchema = z
  .string()
  .min(12, "Use at least 12 characters")
  .max(200, "At most 200 characters");

export const acceptInvitationSchema = z.object({ token: z.string().min(20).max(200), password: passwordSchema });

export const auditQuery = pageQuery.extend({
  action: z.string().trim().max(100).optional(),
  entityType: z.string().trim().max(100).optional(),
  actor: z.string().trim().max(120).optional(),
  siteId: idSchema.optional(),
  from: z.iso.date().optional(),
  to: z.iso.date().optional(),
});
export type AuditQuery = z.infer<typeof auditQuery>;
