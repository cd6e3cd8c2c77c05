/**
 * Figures for the engine computation library: time per computeSpec call on a typical
 * big-twin package, and the gzipped size of calc/ as bundled for the browser.
 * Prints figures only.
 */
import { build } from "esbuild";
import { cpus, loadavg } from "node:os";
import { gzipSync } from "node:zlib";
import { fileURLToPath } from "node:url";
import { computeSpec, type ComputeOptions, type SpecInput, type SpecOutcome } from "../calc/index";

const TYPICAL: SpecInput = {
  boreMm: 101.6, // 4.000 in
  strokeMm: 114.3, // 4.500 in
  cylinders: 2,
  chamberCc: 85,
  gasketBoreMm: 102.1,
  gasketThicknessMm: 1.02,
  deckClearanceMm: 0.25,
  pistonDomeCc: 3,
  rodLengthMm: 190.5, // 7.500 in
  intakeClosesAbdcDeg: 35,
  revLimitRpm: 5800,
};

const HALF_FILLED: SpecInput = { boreMm: 101.6, strokeMm: 114.3 };

/** The bench's full input: a torque target, the lift-basis conversion, the shop's limits. */
const BENCH_FULL: SpecInput = {
  ...TYPICAL,
  torqueNm: 160,
  intakeClosesAddDeg: 15,
  intakeClosesBasis: "seat timing: the card's closing at 1.346 mm (0.053 in) + 15°",
  fuelGrade: "pump 93",
  thresholds: {
    staticCrMax: 10.5,
    dynamicCrMax: 9.2,
    meanPistonSpeedMaxMs: 22.9,
    peakPistonSpeedMaxMs: 37.5,
    quenchMinMm: 0.762,
    quenchMaxMm: 1.27,
    rodRatioMin: 1.5,
    bmepMaxKPa: 1100,
  },
};

// The version before the torque, lift-basis and limit inputs, best batch on this 2-CPU
// machine under load (2 December 2026): printed beside today's figures.
const PREVIOUS_BEST_NS: Record<string, number> = {
  "computeSpec, full package": 5055,
  "computeSpec, bore and stroke only": 2881,
  "computeSpec, full package, figures only ({ steps: false })": 1706,
};

let sink = 0;
/** Reads the figures and every worked step's text, as a screen that shows the work does. */
function keep(r: SpecOutcome): void {
  if (r.ok) {
    sink += r.cautions.length + (r.results.staticCr ?? 0);
    for (const s of r.steps) sink += s.substituted.length;
  } else sink += r.errors.length;
}

function measure(label: string, spec: SpecInput, options?: ComputeOptions, targetNs = 5000): void {
  const batch = 10_000;
  for (let i = 0; i < 50_000; i++) keep(computeSpec(spec, options)); // warm-up
  const perCall: number[] = [];
  for (let b = 0; b < 40; b++) {
    const t0 = process.hrtime.bigint();
    for (let i = 0; i < batch; i++) keep(computeSpec(spec, options));
    const t1 = process.hrtime.bigint();
    perCall.push(Number(t1 - t0) / batch);
  }
  perCall.sort((x, y) => x - y);
  const median = perCall[Math.floor(perCall.length / 2)] ?? NaN;
  const best = perCall[0] ?? NaN;
  console.log(
    `${label}:\n  median ${median.toFixed(0)} ns/call (best batch ${best.toFixed(0)} ns), ` +
      `${Math.round(1e9 / median).toLocaleString("en-US")} calls/s — target < ${targetNs} ns` +
      (PREVIOUS_BEST_NS[label] === undefined
        ? ""
        : `; previous version best batch ${PREVIOUS_BEST_NS[label]} ns`),
  );
}

async function browserSize(): Promise<void> {
  const entry = fileURLToPath(new URL("../calc/index.ts", import.meta.url));
  const out = await build({
    entryPoints: [entry],
    bundle: true,
    minify: true,
    format: "esm",
    platform: "browser",
    write: false,
    logLevel: "silent",
  });
  const code = out.outputFiles[0]?.contents ?? new Uint8Array();
  const gz = gzipSync(code, { level: 9 });
  console.log(
    `browser bundle of calc/index.ts: ${(code.length / 1024).toFixed(1)} kB minified, ` +
      `${(gz.length / 1024).toFixed(2)} kB gzipped — target < 40 kB gzipped`,
  );
}

console.log(
  `node ${process.version}, ${cpus().length} CPU(s), load average ${loadavg()
    .map((x) => x.toFixed(2))
    .join(" ")} (figures are noisy on a busy machine; the best batch shows the unloaded cost)`,
);
measure("computeSpec, full package", TYPICAL);
measure("computeSpec, bore and stroke only", HALF_FILLED);
measure("computeSpec, full package, figures only ({ steps: false })", TYPICAL, { steps: false });
measure(
  "computeSpec, the bench's full input (torque, lift basis, shop limits)",
  BENCH_FULL,
  undefined,
  10_000,
);
await browserSize();
if (sink === -1) console.log(sink);
