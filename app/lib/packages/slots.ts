// The built-in part categories and the bench's slots. Shared by the catalog, the fit
// rules, the spec bench and the keep-check (browser and server).

export const BUILT_IN_CATEGORIES = [
  { slug: "cylinders", label: "Cylinders" },
  { slug: "pistons", label: "Pistons" },
  { slug: "flywheels", label: "Flywheel / crank" },
  { slug: "rods", label: "Rods" },
  { slug: "heads", label: "Heads" },
  { slug: "head_gaskets", label: "Head gaskets" },
  { slug: "cams", label: "Cams" },
  { slug: "valve_springs", label: "Valve springs" },
  { slug: "pushrods", label: "Pushrods" },
  { slug: "intake", label: "Intake / air cleaner" },
  { slug: "exhaust", label: "Exhaust" },
  { slug: "rear_shocks", label: "Rear shocks" },
  { slug: "front_forks", label: "Front fork" },
  { slug: "brake_calipers", label: "Brake calipers" },
  { slug: "brake_rotors", label: "Brake rotors" },
  { slug: "axle_adjusters", label: "Rear-axle adjusters" },
  { slug: "risers", label: "Risers / handlebars" },
  { slug: "clutch_lines", label: "Clutch cable / line" },
  { slug: "brake_lines", label: "Brake lines" },
  { slug: "wheels", label: "Wheels" },
] as const;

export type BuiltInCategory = (typeof BUILT_IN_CATEGORIES)[number]["slug"];

export type SlotGroup = "engine" | "chassis";

export interface SlotDef {
  /** the slot's key, also the object name fit rules use for its part (e.g. `gasket.bore_mm`) */
  key: string;
  label: string;
  category: BuiltInCategory;
  group: SlotGroup;
}

export const SLOTS: readonly SlotDef[] = [
  { key: "cylinder", label: "Bore (cylinders)", category: "cylinders", group: "engine" },
  { key: "flywheel", label: "Stroke (flywheel / crank)", category: "flywheels", group: "engine" },
  { key: "piston", label: "Piston", category: "pistons", group: "engine" },
  { key: "head", label: "Head", category: "heads", group: "engine" },
  { key: "gasket", label: "Head gasket", category: "head_gaskets", group: "engine" },
  { key: "cam", label: "Cam", category: "cams", group: "engine" },
  { key: "springs", label: "Valve springs", category: "valve_springs", group: "engine" },
  { key: "rod", label: "Rod", category: "rods", group: "engine" },
  {
    key: "axle_adjusters",
    label: "Rear-axle adjusters",
    category: "axle_adjusters",
    group: "chassis",
  },
  { key: "rear_shocks", label: "Rear shocks", category: "rear_shocks", group: "chassis" },
  { key: "front_fork", label: "Front fork", category: "front_forks", group: "chassis" },
  { key: "calipers", label: "Brake calipers", category: "brake_calipers", group: "chassis" },
  { key: "rotors", label: "Brake rotors", category: "brake_rotors", group: "chassis" },
  { key: "risers", label: "Risers / handlebars", category: "risers", group: "chassis" },
  { key: "clutch_line", label: "Clutch cable / line", category: "clutch_lines", group: "chassis" },
  { key: "brake_lines", label: "Brake lines", category: "brake_lines", group: "chassis" },
];

export const SLOT_BY_KEY: Record<string, SlotDef> = Object.fromEntries(
  SLOTS.map((s) => [s.key, s]),
);
