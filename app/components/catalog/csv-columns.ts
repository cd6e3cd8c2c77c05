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
    description:
      "Which kind of part it is, written as in the list of kinds below (cylinders for a cylinder)",
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
    description:
      "Words the fit rules look for, separated by a bar (|), e.g. stock-axle-adjusters|locking",
  },
  { name: "stock", required: false, description: "yes or no (also true/false, 1/0)" },
  {
    name: "attributes",
    required: false,
    description:
      "The part's measurements in millimetres, cc or degrees: each as name=number, separated by semicolons. The names for each kind are in the list below.",
  },
  { name: "notes", required: false, description: "Free text" },
] as const;

/** One example row, as a file to download and fill in. */
export const EXAMPLE_CSV = [
  "part_number,category,maker,name,price,labour_hours,tags,stock,attributes,notes",
  'EX-CYL-1048,cylinders,Example Foundry,Big-bore cylinder kit 104.8 mm,1290.00,6.5,big-bore,no,bore_mm=104.8,"Delete this row, then add your own"',
].join("\r\n");
