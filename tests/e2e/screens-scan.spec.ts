// Every page, for every role and signed out, at a desk's width and a phone's: no code name
// of ours reaches the visible text, axe-core finds no serious or critical problem, and a
// screenshot of each is kept under .data/test-results/screens/ to be looked at.
import AxeBuilder from "@axe-core/playwright";
import { expect, test, type Page } from "@playwright/test";
import { mkdirSync } from "node:fs";
import { createDb } from "../../db/connect";
import { ROLES, type Role } from "../../db/schema/core";
import { PACKAGE_STATUSES } from "../../db/schema/packages";
import { FIELD_LABELS } from "../../app/lib/bench/spec";
import { BUILT_IN_CATEGORIES, SLOTS } from "../../app/lib/packages/slots";
import { RESULT_INPUTS } from "../../calc";
import { e2eDatabaseUrl } from "../support/db-url";
import { loginAs } from "./support/login";

const WIDTHS = [
  { name: "desk", width: 1440, height: 900 },
  { name: "phone", width: 390, height: 844 },
] as const;

// Our internal names: category slugs, slot keys and status codes that hold an underscore,
// and the camelCase names of the bench's and calc's fields.
const UNDERSCORED = [
  ...BUILT_IN_CATEGORIES.map((c) => c.slug),
  ...SLOTS.map((s) => s.key),
  ...PACKAGE_STATUSES,
].filter((k) => k.includes("_"));
const CAMEL = [...Object.keys(FIELD_LABELS), ...Object.keys(RESULT_INPUTS), "priceCents"].filter(
  (k) => /[a-z][A-Z]/.test(k),
);
const KEYS = [...new Set([...UNDERSCORED, ...CAMEL])];
const KEY_PATTERN = new RegExp(`\\b(${KEYS.join("|")})\\b`);
// one-word slugs and keys are words too ("cams", "intake"): they count when they are the
// whole text of an element, as a category chip or a card's label would be
const BARE = [
  ...new Set([
    ...BUILT_IN_CATEGORIES.map((c) => c.slug),
    ...SLOTS.map((s) => s.key),
    ...PACKAGE_STATUSES,
  ]),
].filter((k) => !k.includes("_"));

type Ids = { packageId: number; templateId: number; partId: number; ruleId: number };
let ids: Ids;

test.beforeAll(async () => {
  const db = createDb(e2eDatabaseUrl(), 1);
  try {
    const pkg = await db
      .selectFrom("packages")
      .select("id")
      .where("is_template", "=", false)
      .orderBy("id")
      .executeTakeFirstOrThrow();
    const tpl = await db
      .selectFrom("packages")
      .select("id")
      .where("is_template", "=", true)
      .orderBy("id")
      .executeTakeFirstOrThrow();
    const part = await db.selectFrom("parts").select("id").orderBy("id").executeTakeFirstOrThrow();
    const rule = await db
      .selectFrom("fit_rules")
      .select("id")
      .orderBy("id")
      .executeTakeFirstOrThrow();
    ids = { packageId: pkg.id, templateId: tpl.id, partId: part.id, ruleId: rule.id };
  } finally {
    await db.destroy();
  }
});

const PAGES: { path: string; name: string }[] = [
  { path: "/", name: "home" },
  { path: "/packages", name: "packages" },
  { path: "/packages/new", name: "packages-new" },
  { path: "/packages/:package", name: "package" },
  { path: "/packages/:template", name: "template" },
  { path: "/packages/:package/bench", name: "bench" },
  { path: "/parts", name: "parts" },
  { path: "/parts/new", name: "parts-new" },
  { path: "/parts/import", name: "parts-import" },
  { path: "/parts/:part", name: "part" },
  { path: "/rules", name: "rules" },
  { path: "/rules/new", name: "rules-new" },
  { path: "/rules/:rule", name: "rule" },
  { path: "/staff", name: "staff" },
  { path: "/settings", name: "settings" },
  { path: "/dev/outbox", name: "outbox" },
  { path: "/no-such-page", name: "not-found" },
];
const PUBLIC_PAGES = [
  { path: "/login", name: "login" },
  { path: "/reset", name: "reset" },
];

function resolve(path: string): string {
  return path
    .replace(":package", String(ids.packageId))
    .replace(":template", String(ids.templateId))
    .replace(":part", String(ids.partId))
    .replace(":rule", String(ids.ruleId));
}

/** The text a person sees: visible text nodes outside code, inputs and monospaced values. */
async function visibleTexts(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    const skip = "code, pre, kbd, samp, textarea, input, script, style, .font-mono";
    const walker = document.createTreeWalker(document.body, NodeFilter.SHOW_ELEMENT);
    for (
      let el = walker.nextNode() as Element | null;
      el;
      el = walker.nextNode() as Element | null
    ) {
      if (el.closest(skip)) continue;
      if (!(el as HTMLElement).checkVisibility?.({ visibilityProperty: true })) continue;
      const own = [...el.childNodes]
        .filter((n) => n.nodeType === Node.TEXT_NODE)
        .map((n) => n.textContent ?? "")
        .join("")
        .trim();
      if (own) out.push(own);
      const label = el.getAttribute("aria-label");
      if (label) out.push(label);
      if (el instanceof HTMLSelectElement)
        for (const o of el.options) if (o.textContent) out.push(o.textContent.trim());
      const ph = el.getAttribute("placeholder");
      if (ph) out.push(ph);
    }
    return out;
  });
}

async function scan(page: Page, who: string, pageName: string, width: (typeof WIDTHS)[number]) {
  await page.waitForLoadState("networkidle");
  const texts = await visibleTexts(page);
  const leaks = texts.filter((t) => KEY_PATTERN.test(t) || BARE.includes(t));
  expect.soft(leaks, `internal names on ${pageName} for ${who}`).toEqual([]);

  const overflow = await page.evaluate(
    () => document.documentElement.scrollWidth - document.documentElement.clientWidth,
  );
  expect.soft(overflow, `sideways scroll on ${pageName} for ${who}`).toBeLessThanOrEqual(1);

  const axe = await new AxeBuilder({ page })
    .withTags(["wcag2a", "wcag2aa", "wcag21a", "wcag21aa", "wcag22aa"])
    .analyze();
  const bad = axe.violations
    .filter((v) => v.impact === "serious" || v.impact === "critical")
    .map(
      (v) =>
        `${v.id}: ${v.nodes
          .map((n) => n.target.join(" "))
          .slice(0, 5)
          .join(", ")}`,
    );
  expect.soft(bad, `accessibility on ${pageName} for ${who}`).toEqual([]);

  mkdirSync(".data/test-results/screens", { recursive: true });
  await page.screenshot({
    path: `.data/test-results/screens/${who}-${pageName}-${width.width}.png`,
    fullPage: true,
  });
}

for (const width of WIDTHS) {
  test.describe(`${width.name} ${width.width} px`, () => {
    test.use({ viewport: { width: width.width, height: width.height } });

    for (const p of PUBLIC_PAGES) {
      test(`signed out · ${p.name}`, async ({ page }) => {
        await page.goto(p.path);
        await scan(page, "signed-out", p.name, width);
      });
    }

    for (const role of ROLES as readonly Role[]) {
      for (const p of PAGES) {
        test(`${role} · ${p.name}`, async ({ page }) => {
          await loginAs(page, role);
          await page.goto(resolve(p.path));
          await scan(page, role, p.name, width);
        });
      }
    }
  });
}
