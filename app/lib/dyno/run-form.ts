// The dyno run upload form's fields, checked in the browser before sending and on the
// server (the authority) after.
import { z } from "zod";
import { MAX_RUN_BYTES } from "./run";
import { fToC, inHgToKPa } from "./weather";

// eslint-disable-next-line no-control-regex -- control characters are what is refused
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
const text = (max: number, label: string) =>
  z
    .string()
    .trim()
    .max(max, `${label} is at most ${max} characters.`)
    .refine((v) => !CONTROL.test(v), `${label} may not hold control characters.`)
    .default("");
const optionalNumber = (label: string) =>
  z.coerce
    .number({ message: `${label} must be a number.` })
    .refine(Number.isFinite, `${label} must be a number.`)
    .optional();

export const RunFormSchema = z
  .object({
    label: z
      .string({ error: "Name the run (e.g. “after cam”)." })
      .trim()
      .min(1, "Name the run (e.g. “after cam”).")
      .max(80, "The run's name is at most 80 characters.")
      .refine((v) => !CONTROL.test(v), "The run's name may not hold control characters."),
    runDate: z
      .string()
      .regex(/^\d{4}-\d{2}-\d{2}$/, "Pick the run's date.")
      .optional(),
    gear: text(20, "Gear"),
    notes: text(2000, "Notes"),
    torqueUnit: z.enum(["lbft", "nm"], { message: "Choose the file's torque unit." }),
    powerUnit: z.enum(["hp", "kw"], { message: "Choose the file's power unit." }),
    tempUnit: z.enum(["F", "C"]).default("F"),
    baroUnit: z.enum(["inhg", "kpa"]).default("inhg"),
    airTemp: optionalNumber("Air temperature"),
    baro: optionalNumber("Barometric pressure"),
    humidity: optionalNumber("Humidity").refine(
      (v) => v === undefined || (v >= 0 && v <= 100),
      "Humidity is 0–100 %.",
    ),
    dropBad: z.literal("on").optional(),
    file: z
      .instanceof(File, { message: "Choose the run's CSV file." })
      .refine((f) => f.size <= MAX_RUN_BYTES, "The run file is larger than 10 MB."),
  })
  .superRefine((v, ctx) => {
    const c =
      v.airTemp === undefined ? undefined : v.tempUnit === "F" ? fToC(v.airTemp) : v.airTemp;
    if (c !== undefined && (c < -30 || c > 55))
      ctx.addIssue({
        code: "custom",
        path: ["airTemp"],
        message: "Air temperature is −30 to 55 °C (−22 to 131 °F).",
      });
    const kpa =
      v.baro === undefined ? undefined : v.baroUnit === "inhg" ? inHgToKPa(v.baro) : v.baro;
    if (kpa !== undefined && (kpa < 60 || kpa > 110))
      ctx.addIssue({
        code: "custom",
        path: ["baro"],
        message: "Barometric pressure is 60–110 kPa (17.7–32.5 inHg).",
      });
  });
