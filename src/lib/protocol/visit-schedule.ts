import { z } from "zod";

// The schedule of visits stored on every protocol version (structured data, not prose).
// Calendar dates everywhere in src/lib are ISO "YYYY-MM-DD" strings in the site's time zone.

export const anchorEvents = ["consent", "enrolment", "implant"] as const;
export type AnchorEvent = (typeof anchorEvents)[number];

export const scheduledVisitSchema = z.object({
  code: z
    .string()
    .trim()
    .regex(/^[A-Z0-9][A-Z0-9_-]{0,15}$/, "Visit code: 1–16 capitals, digits, '-' or '_'"),
  label: z.string().trim().min(1, "Give the visit a label").max(120),
  anchor: z.enum(anchorEvents),
  dayOffset: z.number().int().min(-365).max(3650),
  windowBefore: z.number().int().min(0).max(365),
  windowAfter: z.number().int().min(0).max(365),
  procedures: z.array(z.string().trim().min(1).max(200)).max(50).default([]),
});
export type ScheduledVisit = z.infer<typeof scheduledVisitSchema>;

export const visitScheduleSchema = z
  .array(scheduledVisitSchema)
  .max(200)
  .superRefine((visits, ctx) => {
    const seen = new Set<string>();
    visits.forEach((v, i) => {
      if (seen.has(v.code)) ctx.addIssue({ code: "custom", path: [i, "code"], message: `Visit code ${v.code} is used twice` });
      seen.add(v.code);
    });
  });
export type VisitSchedule = z.infer<typeof visitScheduleSchema>;

export const isoDateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date as YYYY-MM-DD")
  .refine((s) => !Number.isNaN(Date.parse(`${s}T00:00:00Z`)) && new Date(`${s}T00:00:00Z`).toISOString().startsWith(s), "Not a real calendar date");
export type IsoDate = string;
