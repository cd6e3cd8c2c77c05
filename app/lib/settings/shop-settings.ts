// The owner's shop settings: the form's schema (shared by the page and its action) and
// how each stored value reads on the screen and in the change log.
import { z } from "zod";
import { formatMoney, formatPercent, isTimeZone } from "../format";

// eslint-disable-next-line no-control-regex -- control characters are what is refused
const CONTROL = /[\u0000-\u001f\u007f]/;

const text = (label: string, max: number, required = true) => {
  const base = z
    .string(`Enter the shop's ${label}.`)
    .trim()
    .max(max, `Keep the ${label} under ${max} characters.`)
    .refine((s) => !CONTROL.test(s), `The ${label} holds a control character; retype it.`);
  return required ? base.min(1, `Enter the shop's ${label}.`) : base.optional().default("");
};

/** "135", "135.5", "1,290.00" → cents; anything else is refused beside the field. */
const dollars = (label: string) =>
  z
    .string(`Enter the ${label} in dollars, e.g. 135.00.`)
    .trim()
    .transform((s) => s.replace(/^\$/, "").replace(/,/g, ""))
    .refine((s) => /^\d{1,6}(\.\d{1,2})?$/.test(s), `Enter the ${label} in dollars, e.g. 135.00.`)
    .transform((s) => Math.round(Number(s) * 100));

/** "8.25" → 825 basis points, between 0 and 100 %. */
const percent = (label: string) =>
  z
    .string(`Enter the ${label} as a percentage, e.g. 8.25.`)
    .trim()
    .transform((s) => s.replace(/\s*%$/, ""))
    .refine(
      (s) => /^\d{1,3}(\.\d{1,2})?$/.test(s) && Number(s) <= 100,
      `Enter the ${label} as a percentage from 0 to 100, e.g. 8.25.`,
    )
    .transform((s) => Math.round(Number(s) * 100));

export const ShopSettingsSchema = z
  .object({
    name: text("name", 120),
    address: text("address", 300, false),
    phone: text("phone number", 40, false).refine(
      (s) => s === "" || /^[0-9+()\-. ]{3,40}$/.test(s),
      "Enter a phone number with digits, spaces, + ( ) - or . only.",
    ),
    email: z
      .email("Enter an e-mail address like shop@example.com, or leave it empty.")
      .max(200)
      .or(z.literal(""))
      .optional()
      .default(""),
    labourRate: dollars("labour rate per hour"),
    taxRate: percent("tax rate"),
    depositKind: z.enum(["percent", "fixed"], "Choose how the deposit is set."),
    depositValue: z
      .string("Enter the deposit: a percentage such as 30, or dollars such as 500.00.")
      .trim()
      .transform((s) => s.replace(/^\$/, "").replace(/\s*%$/, "").replace(/,/g, ""))
      .refine(
        (s) => /^\d{1,6}(\.\d{1,2})?$/.test(s),
        "Enter the deposit: a percentage such as 30, or dollars such as 500.00.",
      ),
    timeZone: z
      .string("Choose the shop's time zone.")
      .refine((tz) => isTimeZone(tz) && tz.includes("/"), "Choose a time zone from the list."),
  })
  .transform((v, ctx) => {
    const n = Number(v.depositValue);
    if (v.depositKind === "percent" && n > 100) {
      ctx.addIssue({
        code: "custom",
        path: ["depositValue"],
        message: "A deposit set as a percentage is at most 100 % of the quote.",
      });
      return z.NEVER;
    }
    // basis points of the quote, or cents: both are hundredths of the number typed
    return { ...v, depositValue: Math.round(n * 100) };
  });

export type ShopSettingsInput = z.output<typeof ShopSettingsSchema>;

export interface ShopSettings {
  name: string;
  address: string;
  phone: string;
  email: string;
  labourRateCents: number;
  taxRateBp: number;
  depositKind: "percent" | "fixed";
  /** basis points for "percent", cents for "fixed" */
  depositValue: number;
  timeZone: string;
}

export const SETTING_LABELS: Record<keyof ShopSettings, string> = {
  name: "Shop name",
  address: "Address",
  phone: "Phone",
  email: "E-mail",
  labourRateCents: "Labour rate",
  taxRateBp: "Tax rate",
  depositKind: "Deposit set as",
  depositValue: "Deposit default",
  timeZone: "Time zone",
};

/** How one stored setting reads in the change log and on the page. */
export function describeSetting(
  key: keyof ShopSettings,
  s: Pick<ShopSettings, "depositKind"> & Partial<ShopSettings>,
): string {
  const v = s[key];
  switch (key) {
    case "labourRateCents":
      return `${formatMoney(v as number)} per hour`;
    case "taxRateBp":
      return formatPercent(v as number);
    case "depositKind":
      return v === "fixed" ? "a fixed amount" : "a percentage of the quote";
    case "depositValue":
      return s.depositKind === "fixed"
        ? formatMoney(v as number)
        : `${formatPercent(v as number)} of the quote`;
    default:
      return v === "" || v === undefined ? "(empty)" : String(v);
  }
}

/** The form's starting values for stored settings (money as dollars, rates as percent). */
export function settingsFormValues(s: ShopSettings): Record<string, string> {
  return {
    name: s.name,
    address: s.address,
    phone: s.phone,
    email: s.email,
    labourRate: (s.labourRateCents / 100).toFixed(2),
    taxRate: String(s.taxRateBp / 100),
    depositKind: s.depositKind,
    depositValue:
      s.depositKind === "fixed" ? (s.depositValue / 100).toFixed(2) : String(s.depositValue / 100),
    timeZone: s.timeZone,
  };
}

/** Every zone the runtime knows, for the time-zone list. */
export function timeZoneOptions(): string[] {
  const all =
    typeof Intl.supportedValuesOf === "function" ? Intl.supportedValuesOf("timeZone") : [];
  return all.filter((tz) => tz.includes("/"));
}
