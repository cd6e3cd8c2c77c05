// The forms of a request's page: status, note and convert (told apart by `intent`).
import { z } from "zod";
import { REQUEST_STATUSES } from "../../../db/schema/requests";
import { line, paragraph } from "./text";

const idOrNew = (missing: string) =>
  z.string({ error: missing }).refine((v) => v === "new" || /^[1-9][0-9]{0,9}$/.test(v), missing);

const optionalId = z.preprocess(
  (v) => (v === "" ? undefined : v),
  z.coerce.number().int().positive().max(2_147_483_647).optional(),
);

export const VIN_MESSAGE = "A VIN has 17 letters and digits (no I, O or Q)";

export const PartLineSchema = z
  .object({
    include: z.preprocess((v) => v === "on" || v === true, z.boolean()),
    description: line("Describe the part", 200),
    partId: optionalId,
    category: z.preprocess((v) => (v === "" ? undefined : v), z.string().max(60).optional()),
  })
  .superRefine((v, ctx) => {
    if (v.include && v.partId === undefined && !v.category)
      ctx.addIssue({
        code: "custom",
        path: ["category"],
        message: "Pick the catalog part, or a category for the free text",
      });
  });

export const ConvertSchema = z
  .object({
    intent: z.literal("convert"),
    customer: idOrNew("Pick the customer to link, or a new one"),
    confirmNew: z.preprocess((v) => v === "on" || v === true, z.boolean()),
    bike: idOrNew("Pick the bike, or a new one"),
    vin: z.preprocess(
      (v) => (typeof v === "string" && v.trim() === "" ? undefined : v),
      z
        .string()
        .trim()
        .transform((v) => v.toUpperCase())
        .refine((v) => /^[A-HJ-NPR-Z0-9]{17}$/.test(v), VIN_MESSAGE)
        .optional(),
    ),
    engineFamilyId: optionalId,
    builderId: z.coerce
      .number({ error: "Pick the builder who drafts the package" })
      .int()
      .positive("Pick the builder who drafts the package"),
    packageName: line("Give the draft package a name", 120),
    parts: z.array(PartLineSchema).max(40).optional().default([]),
  })
  .superRefine((v, ctx) => {
    if (v.customer === "new" && v.bike !== "new")
      ctx.addIssue({
        code: "custom",
        path: ["bike"],
        message: "A new customer has no bike on file yet: pick “New bike”",
      });
  });

export type ConvertInput = z.infer<typeof ConvertSchema>;

export const StatusSchema = z.object({
  intent: z.literal("status"),
  to: z.enum(REQUEST_STATUSES, { error: "Pick a status" }),
});

export const NoteSchema = z.object({
  intent: z.literal("note"),
  body: paragraph(2000).refine((v) => v.length > 0, "Write the note first"),
});

export const RequestActionSchema = z.discriminatedUnion("intent", [
  StatusSchema,
  NoteSchema,
  // convert is parsed on its own (ConvertSchema has refinements)
  z.object({ intent: z.literal("convert") }).passthrough(),
]);
