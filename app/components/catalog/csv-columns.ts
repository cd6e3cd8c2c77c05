// The catalog CSV's columns, shown on the import page and used by the server.
export const MAX_CSV_BYTES = 2 * 1024 * 1024;
export const MAX_CSV_ROWS = 5000;

export const CSV_COLUMNS = [
  {
    name: "part_number",
    required: true,
    description:
      "The shop's part number (letters, digits, . _ / -). An existing number is updated, a new one added.",
  },
  {
    name: "category",
    required: true,
    description: "A category slug, e.g. cylinders, head_gaskets, axle_adjusters",
  },
  { name: "maker", required: true, description: "The maker's name" },
  { name: "name", required: true, description: "What the part is" },
  {
    name: "price",
    required: true,
    description:
      "Price in dollars, e.g. 1349.00 (left out of exports for roles that do not see prices)",
  },
  { name: "labour_hours", required: false, description: "Fitting time in hours, e.g. 6.5" },
  {
    name: "tags",
    required: false,
    description: "Tags separated by |, e.g. stock-axle-adjusters|locking",
  },
  { name: "stock", required: false, description: "yes or no (also true/false, 1/0)" },
  {
    name: "attributes",
    required: false,
    description:
      "The category's measurements as key=value pairs separated by ;, e.g. boreMm=104.8 or bore_mm=104.8;compressed_thickness_mm=1.02",
  },
  { name: "notes", required: false, description: "Free text" },
] as const;
