import type { Kysely, Transaction } from "kysely";
import { ensureBuiltInCategories, getPartByNumber } from "../../app/lib/catalog.server";
import { createRule, updateRule, type RuleFields } from "../../app/lib/fit-rules.server";
import { createPart } from "../../app/lib/catalog.server";
import type { Database } from "../schema";

// The demo parts shelf and fit rules of the invented shop. Every maker, part number
// and price is made up; the numbers are in the range of big-twin engine parts.
type P = [number: string, category: string, maker: string, name: string, price: number, hours: number, tags: string, stock: boolean, attributes: Record<string, number>];

const IV = "Ironvale";
const QL = "Quenchline Components";
const MG = "Marrowgate Machine";
const TF = "Tallowfield Speed";
const CB = "Corrie Bend Cycle";
const VM = "Vantry Motorworks";
const AG = "Ashgrove Metalcraft";
const AT053 = 1.346; // cam timing given at 0.053 in of lift

export const DEMO_PARTS: P[] = [
  ["TW-CYL-0984", "cylinders", VM, "Cylinder pair, 98.4 mm (as delivered)", 0, 0, "stock-cylinders", true, { boreMm: 98.4 }],
  ["TW-CYL-1016", "cylinders", VM, "Cylinder pair, 101.6 mm (as delivered, large twin)", 0, 0, "stock-cylinders", true, { boreMm: 101.6 }],
  ["TW-CYL-1040", "cylinders", IV, "Bored cylinder pair, 104.0 mm", 1189, 6, "big-bore", false, { boreMm: 104.0 }],
  ["TW-CYL-1048", "cylinders", IV, "Big-bore cylinder pair, 104.8 mm", 1349, 6.5, "big-bore", false, { boreMm: 104.8 }],
  ["TW-CYL-1064", "cylinders", MG, "Plated cylinder pair, 106.4 mm", 1620, 7, "big-bore plated", false, { boreMm: 106.4 }],
  ["TW-CYL-1080", "cylinders", MG, "Plated cylinder pair, 107.95 mm", 1795, 7.5, "big-bore plated", false, { boreMm: 107.95 }],
  ["TW-FLY-1111", "flywheels", TF, "Flywheel assembly, 111.1 mm stroke", 1450, 10, "", false, { strokeMm: 111.1 }],
  ["TW-FLY-1143", "flywheels", VM, "Flywheel assembly, 114.3 mm stroke (as delivered)", 0, 0, "stock-flywheel", true, { strokeMm: 114.3 }],
  ["TW-FLY-1175", "flywheels", TF, "Stroker flywheel assembly, 117.5 mm", 2290, 12, "stroker", false, { strokeMm: 117.5 }],
  ["TW-FLY-1207", "flywheels", TF, "Stroker flywheel assembly, 120.65 mm", 2540, 12, "stroker", false, { strokeMm: 120.65 }],
  ["TW-ROD-1890", "rods", VM, "Rod set, 189.0 mm (as delivered)", 0, 0, "stock-rods", true, { lengthMm: 189.0 }],
  ["TW-ROD-1905", "rods", AG, "Forged rod set, 190.5 mm", 689, 3, "forged", false, { lengthMm: 190.5 }],
  ["TW-ROD-1930", "rods", AG, "Long rod set, 193.0 mm", 749, 3, "forged", false, { lengthMm: 193.0 }],
  ["TW-PST-0984", "pistons", VM, "Piston pair, 98.4 mm, flat top (as delivered)", 0, 0, "stock-pistons", true, { domeCc: -2.5, compressionHeightMm: 38.1, forBoreMm: 98.4 }],
  ["TW-PST-1016", "pistons", VM, "Piston pair, 101.6 mm, dished (as delivered)", 0, 0, "stock-pistons", true, { domeCc: -4.8, compressionHeightMm: 38.1, forBoreMm: 101.6 }],
  ["TW-PST-1016D", "pistons", QL, "Forged piston pair, 101.6 mm, +2 cc dome", 489, 2, "forged", false, { domeCc: 2.0, compressionHeightMm: 37.6, forBoreMm: 101.6 }],
  ["TW-PST-1048F", "pistons", QL, "Forged piston pair, 104.8 mm, flat top", 529, 2, "forged", false, { domeCc: -1.2, compressionHeightMm: 37.6, forBoreMm: 104.8 }],
  ["TW-PST-1048D", "pistons", QL, "Forged piston pair, 104.8 mm, +4 cc dome", 549, 2, "forged high-compression", false, { domeCc: 4.1, compressionHeightMm: 37.6, forBoreMm: 104.8 }],
  ["TW-PST-1064", "pistons", IV, "Forged piston pair, 106.4 mm, dished", 569, 2, "forged", false, { domeCc: -3.0, compressionHeightMm: 36.8, forBoreMm: 106.4 }],
  ["TW-PST-1080", "pistons", IV, "Forged piston pair, 107.95 mm, flat top", 589, 2, "forged", false, { domeCc: -0.8, compressionHeightMm: 36.8, forBoreMm: 107.95 }],
  ["TW-HD-0890", "heads", VM, "Cylinder heads, 89 cc (as delivered)", 0, 0, "stock-heads", true, { chamberCc: 89, intakeValveMm: 49.5, exhaustValveMm: 40.6 }],
  ["TW-HD-0845", "heads", MG, "Ported heads, 84.5 cc", 1890, 8, "ported", false, { chamberCc: 84.5, intakeValveMm: 50.8, exhaustValveMm: 41.4 }],
  ["TW-HD-0885CR", "heads", MG, "Ported heads with compression-release ports, 88.5 cc", 2190, 9, "ported compression-release", false, { chamberCc: 88.5, intakeValveMm: 50.8, exhaustValveMm: 41.4 }],
  ["TW-HD-0800", "heads", TF, "CNC heads, 80 cc", 2450, 9, "ported cnc", false, { chamberCc: 80, intakeValveMm: 52.1, exhaustValveMm: 42.2 }],
  ["TW-HD-0920", "heads", TF, "Touring heads, 92 cc", 1490, 8, "ported", false, { chamberCc: 92, intakeValveMm: 49.5, exhaustValveMm: 40.6 }],
  ["TW-HG-0991", "head_gaskets", VM, "Head gaskets, 99.1 mm × 1.02 mm (as delivered)", 0, 0.5, "stock-gaskets", true, { boreMm: 99.1, compressedThicknessMm: 1.02 }],
  ["TW-HG-1021-076", "head_gaskets", QL, "MLS head gaskets, 102.1 mm × 0.76 mm", 89, 0.5, "mls", false, { boreMm: 102.1, compressedThicknessMm: 0.76 }],
  ["TW-HG-1021-102", "head_gaskets", QL, "MLS head gaskets, 102.1 mm × 1.02 mm", 89, 0.5, "mls", false, { boreMm: 102.1, compressedThicknessMm: 1.02 }],
  ["TW-HG-1021-130", "head_gaskets", QL, "MLS head gaskets, 102.1 mm × 1.30 mm", 89, 0.5, "mls", false, { boreMm: 102.1, compressedThicknessMm: 1.3 }],
  ["TW-HG-1054", "head_gaskets", QL, "MLS head gaskets, 105.4 mm × 1.02 mm", 95, 0.5, "mls", false, { boreMm: 105.4, compressedThicknessMm: 1.02 }],
  ["TW-HG-1085", "head_gaskets", QL, "MLS head gaskets, 108.5 mm × 1.02 mm", 99, 0.5, "mls", false, { boreMm: 108.5, compressedThicknessMm: 1.02 }],
  ["TW-CAM-STD", "cams", VM, "Cam, 0.530 in lift (as delivered)", 0, 0, "stock-cam", true, { intakeClosesAbdcDeg: 28, intakeLiftMm: 13.46, exhaustLiftMm: 13.46, intakeDurationDeg: 224, timingAtLiftMm: AT053 }],
  ["TW-CAM-585", "cams", CB, "Bolt-in cam, 0.585 in lift", 399, 4, "bolt-in", false, { intakeClosesAbdcDeg: 32, intakeLiftMm: 14.86, exhaustLiftMm: 14.86, intakeDurationDeg: 232, timingAtLiftMm: AT053 }],
  ["TW-CAM-600G", "cams", CB, "Gear-drive cam, 0.600 in lift", 629, 5, "gear-drive-cam", false, { intakeClosesAbdcDeg: 36, intakeLiftMm: 15.24, exhaustLiftMm: 15.24, intakeDurationDeg: 240, timingAtLiftMm: AT053 }],
  ["TW-CAM-640", "cams", CB, "Torque cam, 0.640 in lift", 449, 4, "", false, { intakeClosesAbdcDeg: 40, intakeLiftMm: 16.26, exhaustLiftMm: 16.0, intakeDurationDeg: 246, timingAtLiftMm: AT053 }],
  ["TW-CAM-650G", "cams", CB, "Gear-drive cam, 0.650 in lift", 679, 5, "gear-drive-cam", false, { intakeClosesAbdcDeg: 44, intakeLiftMm: 16.51, exhaustLiftMm: 16.51, intakeDurationDeg: 254, timingAtLiftMm: AT053 }],
  ["TW-CAM-675", "cams", AG, "Race cam, 0.675 in lift", 489, 4, "race", false, { intakeClosesAbdcDeg: 50, intakeLiftMm: 17.15, exhaustLiftMm: 16.76, intakeDurationDeg: 262, timingAtLiftMm: AT053 }],
  ["TW-VS-600", "valve_springs", VM, "Valve springs, rated to 0.600 in lift (as delivered)", 0, 0, "stock-springs", true, { maxLiftMm: 15.24 }],
  ["TW-VS-650", "valve_springs", AG, "Beehive valve springs, rated to 0.650 in lift", 279, 3, "beehive", false, { maxLiftMm: 16.51 }],
  ["TW-VS-700", "valve_springs", AG, "Dual valve springs, rated to 0.700 in lift", 339, 3.5, "dual-spring", false, { maxLiftMm: 17.78 }],
  ["TW-PR-ADJ", "pushrods", AG, "Adjustable pushrods, quick-install", 249, 1.5, "adjustable-pushrods", false, {}],
  ["TW-PR-STD", "pushrods", VM, "Pushrods (as delivered)", 0, 0, "stock-pushrods", true, {}],
  ["TW-AIR-STD", "intake", VM, "Air cleaner (as delivered)", 0, 0, "stock-intake", true, {}],
  ["TW-AIR-HF", "intake", TF, "High-flow air cleaner", 329, 1, "high-flow-intake", false, {}],
  ["TW-TB-58", "intake", TF, "58 mm throttle body", 799, 2.5, "big-throttle-body", false, {}],
  ["TW-EX-STD", "exhaust", VM, "Exhaust system (as delivered)", 0, 0, "stock-exhaust", true, {}],
  ["TW-EX-21", "exhaust", MG, "2-into-1 exhaust, stainless", 1199, 2.5, "two-into-one", false, {}],
  ["TW-EX-TD", "exhaust", MG, "True-dual exhaust, black", 1049, 2.5, "true-dual", false, {}],
  ["TW-SH-STD", "rear_shocks", VM, "Rear shocks (as delivered)", 0, 0, "stock-shocks", true, {}],
  ["TW-SH-13", "rear_shocks", CB, "Adjustable rear shocks, 13 in", 899, 1.5, "adjustable-shocks", false, {}],
  ["TW-FK-CRT", "front_forks", CB, "Fork cartridge kit", 1099, 4, "fork-cartridge", false, {}],
  ["TW-CAL-STD", "brake_calipers", VM, "Brake calipers (as delivered)", 0, 0, "stock-calipers", true, {}],
  ["TW-CAL-4P", "brake_calipers", IV, "Four-piston front calipers", 1290, 2, "four-piston", false, {}],
  ["TW-ROT-STD", "brake_rotors", VM, "Brake rotors (as delivered)", 0, 0, "stock-rotors", true, {}],
  ["TW-ROT-320", "brake_rotors", IV, "Floating rotors, 320 mm", 640, 1.5, "floating-rotors", false, {}],
  ["TW-AX-STD", "axle_adjusters", VM, "Rear-axle adjusters (as delivered)", 0, 0, "stock-axle-adjusters", true, {}],
  ["TW-AX-LOCK", "axle_adjusters", IV, "Locking rear-axle adjusters", 189, 1.5, "locking-axle-adjusters", false, { ratedHp: 220, ratedTorqueNm: 300 }],
  ["TW-RS-04", "risers", VM, "Risers, 4 in (as delivered)", 0, 0, "stock-risers", true, { heightIn: 4 }],
  ["TW-RS-10", "risers", CB, "Handlebar and risers, 10 in", 389, 3, "tall-bars", false, { heightIn: 10 }],
  ["TW-RS-12", "risers", CB, "Handlebar and risers, 12 in", 419, 3.5, "tall-bars", false, { heightIn: 12 }],
  ["TW-RS-14", "risers", CB, "Handlebar and risers, 14 in", 449, 4, "tall-bars", false, { heightIn: 14 }],
  ["TW-RS-16", "risers", CB, "Handlebar and risers, 16 in", 479, 4.5, "tall-bars", false, { heightIn: 16 }],
  ["TW-CL-STD", "clutch_lines", VM, "Clutch cable (as delivered)", 0, 0, "stock-clutch-cable", true, { lengthIn: 58 }],
  ["TW-CL-P06", "clutch_lines", AG, "Clutch cable, +6 in", 79, 1, "extended-clutch-cable", false, { lengthIn: 64 }],
  ["TW-CL-P10", "clutch_lines", AG, "Clutch cable, +10 in, heavy duty", 99, 1, "extended-clutch-cable", false, { lengthIn: 68, ratedHp: 200 }],
  ["TW-BL-STD", "brake_lines", VM, "Brake lines (as delivered)", 0, 0, "stock-brake-lines", true, { lengthIn: 48 }],
  ["TW-BL-P06", "brake_lines", AG, "Braided brake lines, +6 in", 189, 2, "extended-brake-lines", false, { lengthIn: 54 }],
  ["TW-BL-P10", "brake_lines", AG, "Braided brake lines, +10 in", 209, 2, "extended-brake-lines", false, { lengthIn: 58 }],
  ["TW-WH-STD", "wheels", VM, "Cast wheels (as delivered)", 0, 0, "stock-wheels", true, {}],
  ["TW-WH-21", "wheels", IV, "21 in front wheel, forged", 1890, 2, "big-front-wheel", false, {}],
];

const DEFER = "Follow the parts maker's instructions and torque values; have the work checked by a qualified technician.";

function demoRules(lockingId: number | null, clutchId: number | null, brakeId: number | null): RuleFields[] {
  return [
    {
      name: "Stock rear-axle adjusters above 145 hp",
      kind: "upgrade",
      // common practice: shops treat roughly 145 hp as the line for locking adjusters
      condition: 'power_hp > 145 and has("stock-axle-adjusters")',
      message: `Above about 145 hp the stock rear-axle adjusters can let the axle walk under load. Fit locking adjusters. ${DEFER}`,
      upgrade_category: "axle_adjusters",
      suggested_part_id: lockingId,
      active: true,
    },
    {
      name: "Risers over 12 in need a longer clutch cable",
      kind: "upgrade",
      // common practice: tall bars pull the stock cable tight at full lock
      condition: 'riser_in > 12 and has("stock-clutch-cable")',
      message: "Risers taller than 12 in leave the stock clutch cable too short at full lock. Fit a longer cable and check the clutch adjusts fully.",
      upgrade_category: "clutch_lines",
      suggested_part_id: clutchId,
      active: true,
    },
    {
      name: "Risers over 12 in need longer brake lines",
      kind: "upgrade",
      // common practice
      condition: 'riser_in > 12 and has("stock-brake-lines")',
      message: `Risers taller than 12 in stretch the stock brake lines. Fit longer lines and bleed the system. ${DEFER}`,
      upgrade_category: "brake_lines",
      suggested_part_id: brakeId,
      active: true,
    },
    {
      name: "Head gasket bore smaller than the cylinder bore",
      kind: "conflict",
      condition: 'filled("gasket") and filled("cylinder") and gasket.bore_mm < cylinder.bore_mm',
      message: "The head gasket's bore is smaller than the cylinder bore: the piston would hit the gasket's edge. Choose a gasket made for this bore.",
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    },
    {
      name: "High static compression without a compression release",
      kind: "caution",
      // common practice: above about 11:1 the starter strains without a compression release
      condition: 'known(cr_static) and cr_static > 11 and not has("compression-release")',
      message: "Static compression above 11:1 without a compression release strains the starter and battery. Consider heads with compression-release ports; check the fuel the customer can buy.",
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    },
    {
      name: "Cam lift beyond the valve springs' rating",
      kind: "conflict",
      condition: 'filled("cam") and filled("springs") and cam.lift_mm > springs.max_lift_mm',
      message: "The cam lifts the valves further than the springs are rated for: they can bind. Fit the springs the cam maker lists for this lift and check coil-bind and retainer clearance to the maker's figures.",
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    },
    {
      name: "Wide quench",
      kind: "caution",
      // common practice: shops aim for about 0.9–1.0 mm (0.035–0.040 in) of quench
      condition: "known(quench_mm) and quench_mm > 1.3",
      message: "Quench over 1.3 mm gives up the squish that resists detonation. A thinner gasket or a different deck height brings it back.",
      upgrade_category: null,
      suggested_part_id: null,
      active: true,
    },
  ];
}

export async function seedCatalog(trx: Transaction<Database> | Kysely<Database>) {
  await ensureBuiltInCategories(trx);
  const owner = await trx.selectFrom("users").select("id").where("role", "=", "owner").orderBy("id").executeTakeFirst();
  const by = owner?.id ?? null;
  for (const [part_number, category, maker, name, price, labour_hours, tags, stock, attributes] of DEMO_PARTS) {
    await createPart(trx, { part_number, category, maker, name, price, labour_hours, tags: tags.split(" ").filter(Boolean), stock, notes: "", attributes }, by, "Added to the shelf");
  }
  const idOf = async (n: string) => (await getPartByNumber(trx, n))?.id ?? null;
  const rules = demoRules(await idOf("TW-AX-LOCK"), await idOf("TW-CL-P06"), await idOf("TW-BL-P06"));
  const db = trx as unknown as Kysely<Database>;
  for (const r of rules) {
    // the axle rule was first written at 150 hp, then lowered: its history shows both
    const first = r.kind === "upgrade" && r.upgrade_category === "axle_adjusters" ? { ...r, condition: r.condition.replace("145", "150") } : r;
    const made = await createRule(db, first, by);
    if (!made.ok) throw new Error(`demo rule refused: ${r.name}: ${made.check.message}`);
    if (first !== r) await updateRule(db, made.rule.id, r, made.rule.version, by, "Lowered to 145 hp after the spring's dyno days");
  }
}
