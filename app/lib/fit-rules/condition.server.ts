/* eslint-disable @typescript-eslint/no-explicit-any -- mathjs nodes are untyped; the checker narrows each by its `type` before use */
// Fit-rule conditions: parsed by mathjs, checked against an allow-list of node types,
// names and functions, then compiled to plain closures over a package snapshot. mathjs
// never evaluates anything: only its parser runs, and only on checked text.
import { create, parseDependencies, type MathNode } from "mathjs";
import { FUNCTION_BY_NAME, SLOT_BY_NAME, TOP_LEVEL_BY_NAME, type ValueType } from "./names";
import { snapshotHas, type PackageSnapshot, type SlotSnapshot } from "./snapshot";

const math = create({ parseDependencies });

export const CONDITION_LIMITS = {
  maxLength: 2000,
  maxNodes: 300,
  maxDepth: 40,
  maxBracketDepth: 24,
  maxExponent: 10,
  maxTextLength: 200,
} as const;

export type CheckResult =
  | { ok: true; names: string[]; functions: string[] }
  | { ok: false; message: string; index?: number; fragment?: string };

/** An evaluation that cannot give an answer for this package (missing value, wrong type). */
export class RuleEvalError extends Error {
  override name = "RuleEvalError";
}

class Refusal extends Error {
  constructor(
    message: string,
    readonly fragment?: string,
    readonly index?: number,
  ) {
    super(message);
  }
}

export type EvalContext = { scope: Map<string, unknown>; snapshot: PackageSnapshot };
type Fn = (ctx: EvalContext) => unknown;
type Ty = ValueType;
type Checked = { ty: Ty; fn: Fn };
export type Read = { label: string; read: (ctx: EvalContext) => unknown };

export type CompiledCondition = {
  test: (ctx: EvalContext) => boolean;
  reads: Read[];
  names: string[];
  functions: string[];
};

/** The scope conditions are evaluated in: documented names only, slot objects by key. */
export function buildScope(snapshot: PackageSnapshot): EvalContext {
  const scope = new Map<string, unknown>();
  for (const name of TOP_LEVEL_BY_NAME.keys())
    scope.set(
      name,
      name === "power_basis"
        ? snapshot.power_basis
        : (snapshot.numbers[name as keyof PackageSnapshot["numbers"]] ?? null),
    );
  for (const key of SLOT_BY_NAME.keys())
    scope.set(key, Object.hasOwn(snapshot.slots, key) ? snapshot.slots[key] : null);
  return { scope, snapshot };
}

const ARITH: Record<string, (a: number, b: number) => number> = {
  add: (a, b) => a + b,
  subtract: (a, b) => a - b,
  multiply: (a, b) => a * b,
  divide: (a, b) => a / b,
  mod: (a, b) => a % b,
  pow: (a, b) => a ** b,
};
const COMPARE: Record<string, (a: number, b: number) => boolean> = {
  larger: (a, b) => a > b,
  smaller: (a, b) => a < b,
  largerEq: (a, b) => a >= b,
  smallerEq: (a, b) => a <= b,
};
const OP_TEXT: Record<string, string> = {
  larger: ">",
  smaller: "<",
  largerEq: ">=",
  smallerEq: "<=",
  equal: "==",
  unequal: "!=",
};

const NODE_REFUSALS: Record<string, string> = {
  AssignmentNode: "Assignment (=) is not allowed in a condition; to compare, write ==",
  FunctionAssignmentNode: "Defining functions is not allowed in a condition",
  BlockNode: "Write one condition only: remove the ';' or line break between expressions",
  ArrayNode: "Lists and matrices ([ … ]) are not allowed in a condition",
  RangeNode: "Ranges (a:b) are not allowed in a condition",
  ObjectNode: "Objects ({ … }) are not allowed in a condition",
  IndexNode: "Indexing is only allowed as slot.attribute",
};

function num(v: unknown, what: string): number {
  if (typeof v !== "number") throw new RuleEvalError(`${what} is ${describe(v)}, not a number`);
  return v;
}
function bool(v: unknown, what: string): boolean {
  if (typeof v !== "boolean") throw new RuleEvalError(`${what} is ${describe(v)}, not true/false`);
  return v;
}
function describe(v: unknown): string {
  if (v === null || v === undefined) return "empty";
  if (typeof v === "string") return `the text "${v.slice(0, 40)}"`;
  return String(v);
}
function finite(v: number, what: string): number {
  if (!Number.isFinite(v))
    throw new RuleEvalError(`${what} gives no finite number (division by zero?)`);
  return v;
}

const WORD_CHAR = /[A-Za-z0-9_]/;

/**
 * Where `fragment` (an offending node's own text, as mathjs prints it) stands in the
 * condition, or undefined when that is not certain. mathjs keeps no positions, so the
 * node's text is looked for in the condition ignoring spaces and the kind of quotes
 * (the ways its printing differs from common writing), as whole tokens (a name inside
 * a longer name, or 1000 inside 1000.5, is not it), and an index is given only when it
 * stands there exactly once.
 */
export function locateOnce(text: string, fragment: string | undefined): number | undefined {
  if (!fragment) return undefined;
  const norm = (c: string) => (c === "'" ? '"' : c);
  const at: number[] = [];
  let compact = "";
  for (let i = 0; i < text.length; i++) {
    if (/\s/.test(text[i]!)) continue;
    compact += norm(text[i]!);
    at.push(i);
  }
  const needle = [...fragment]
    .filter((c) => !/\s/.test(c))
    .map(norm)
    .join("");
  if (!needle) return undefined;
  const startsWord = WORD_CHAR.test(needle[0]!);
  const endsWord = WORD_CHAR.test(needle.at(-1)!);
  let found: number | undefined;
  for (let from = compact.indexOf(needle); from >= 0; from = compact.indexOf(needle, from + 1)) {
    const start = at[from]!;
    const end = at[from + needle.length - 1]! + 1;
    if (startsWord && start > 0 && WORD_CHAR.test(text[start - 1]!)) continue;
    if (
      endsWord &&
      end < text.length &&
      (WORD_CHAR.test(text[end]!) || (text[end] === "." && /\d/.test(text[end + 1] ?? "")))
    )
      continue;
    if (found !== undefined) return undefined; // more than one place: not sure which
    found = start;
  }
  return found;
}

function nodeText(node: MathNode): string {
  try {
    return node.toString().slice(0, 120);
  } catch {
    return node.type;
  }
}

function preScan(text: string): void {
  let depth = 0;
  let quote: string | null = null;
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!;
    const code = c.charCodeAt(0);
    if (code < 32 && c !== "\n" && c !== "\t" && c !== "\r")
      throw new Refusal(
        "The condition holds a control character; retype it as plain text",
        undefined,
        i,
      );
    if (quote) {
      if (c === "\\") i++;
      else if (c === quote) quote = null;
      continue;
    }
    if (c === '"' || c === "'") quote = c;
    else if (c === "(" || c === "[" || c === "{") {
      depth++;
      if (depth > CONDITION_LIMITS.maxBracketDepth)
        throw new Refusal(
          `Brackets are nested more than ${CONDITION_LIMITS.maxBracketDepth} deep`,
          c,
          i,
        );
    } else if (c === ")" || c === "]" || c === "}") depth--;
  }
}

type Acc = {
  names: Set<string>;
  functions: Set<string>;
  reads: Map<string, Read>;
  nodes: number;
  text: string;
};

function refuse(acc: Acc, message: string, node?: MathNode, word?: string): never {
  const fragment = word ?? (node ? nodeText(node) : undefined);
  throw new Refusal(message, fragment, locateOnce(acc.text, fragment));
}

function walk(node: MathNode, depth: number, acc: Acc): Checked {
  if (++acc.nodes > CONDITION_LIMITS.maxNodes)
    refuse(
      acc,
      `The condition is too long (more than ${CONDITION_LIMITS.maxNodes} parts); split it into several rules`,
    );
  if (depth > CONDITION_LIMITS.maxDepth)
    refuse(
      acc,
      `The condition is nested more than ${CONDITION_LIMITS.maxDepth} levels deep; split it into several rules`,
      node,
    );
  const n = node as MathNode & Record<string, any>;
  switch (node.type) {
    case "ConstantNode":
      return constant(n, acc);
    case "SymbolNode":
      return symbol(n.name as string, acc);
    case "ParenthesisNode":
      return walk(n.content, depth + 1, acc);
    case "AccessorNode":
      return accessor(n, acc);
    case "OperatorNode":
      return operator(n, depth, acc);
    case "RelationalNode":
      return relational(n, depth, acc);
    case "ConditionalNode":
      return conditional(n, depth, acc);
    case "FunctionNode":
      return call(n, depth, acc);
    default:
      return refuse(
        acc,
        NODE_REFUSALS[node.type] ??
          `${node.type.replace(/Node$/, "")} expressions are not allowed in a condition`,
        node,
      );
  }
}

function constant(n: Record<string, any>, acc: Acc): Checked {
  const v = n.value as unknown;
  if (typeof v === "number") {
    if (!Number.isFinite(v)) refuse(acc, "Numbers must be finite", n as MathNode);
    return { ty: "number", fn: () => v };
  }
  if (typeof v === "string") {
    if (v.length > CONDITION_LIMITS.maxTextLength)
      refuse(
        acc,
        `Text in quotes is limited to ${CONDITION_LIMITS.maxTextLength} characters`,
        n as MathNode,
      );
    return { ty: "text", fn: () => v };
  }
  if (typeof v === "boolean") return { ty: "boolean", fn: () => v };
  return refuse(
    acc,
    "Empty values (null, undefined) cannot be written; use known(x) to test whether a value exists",
    n as MathNode,
  );
}

function symbol(name: string, acc: Acc): Checked {
  const doc = TOP_LEVEL_BY_NAME.get(name);
  if (doc) {
    acc.names.add(name);
    const read = (ctx: EvalContext) => ctx.scope.get(name) ?? null;
    acc.reads.set(name, { label: name, read });
    const fn = (ctx: EvalContext) => {
      const v = ctx.scope.get(name);
      if (v === null || v === undefined)
        throw new RuleEvalError(`${name} has no value in this package`);
      return v;
    };
    return { ty: doc.type, fn };
  }
  if (SLOT_BY_NAME.has(name))
    refuse(
      acc,
      `"${name}" is a slot: read one of its attributes (e.g. ${name}.${SLOT_BY_NAME.get(name)!.fields[0]!.name}) or test it with filled("${name}")`,
      undefined,
      name,
    );
  if (FUNCTION_BY_NAME.has(name))
    refuse(
      acc,
      `${name} is a function: call it with brackets, e.g. ${FUNCTION_BY_NAME.get(name)!.signature}`,
      undefined,
      name,
    );
  return refuse(
    acc,
    `Unknown name "${name.slice(0, 60)}": use one of the names listed in the reference`,
    undefined,
    name,
  );
}

function accessor(n: Record<string, any>, acc: Acc): Checked {
  const obj = n.object as MathNode & Record<string, any>;
  const index = n.index as Record<string, any>;
  if (n.optionalChaining)
    refuse(acc, "Optional access (?.) is not allowed; use known(x) instead", n as MathNode);
  if (obj.type !== "SymbolNode" || !SLOT_BY_NAME.has(obj.name)) {
    const what =
      obj.type === "SymbolNode" ? `"${String(obj.name).slice(0, 60)}"` : "that expression";
    refuse(
      acc,
      `Only slots have attributes; ${what} is not a slot (slots: ${[...SLOT_BY_NAME.keys()].join(", ")})`,
      n as MathNode,
    );
  }
  const slotKey = obj.name as string;
  const slot = SLOT_BY_NAME.get(slotKey)!;
  const dims = (index?.dimensions ?? []) as Array<Record<string, any>>;
  const first = dims[0];
  if (dims.length !== 1 || first?.type !== "ConstantNode" || typeof first.value !== "string") {
    refuse(
      acc,
      `Read a slot attribute by its name, e.g. ${slotKey}.${slot.fields[0]!.name}`,
      n as MathNode,
    );
  }
  const field = first!.value as string;
  const doc = slot.fields.find((f) => f.name === field);
  if (!doc) {
    refuse(
      acc,
      `"${field.slice(0, 60)}" is not an attribute of ${slotKey}; it has ${slot.fields.map((f) => f.name).join(", ")}`,
      n as MathNode,
      field.length <= 60 ? field : undefined,
    );
  }
  const label = `${slotKey}.${field}`;
  acc.names.add(label);
  const lookup = (ctx: EvalContext, strict: boolean): unknown => {
    const part = ctx.scope.get(slotKey) as SlotSnapshot | null | undefined;
    if (!part) {
      if (strict) throw new RuleEvalError(`no part in the ${slotKey} slot (for ${label})`);
      return null;
    }
    const v =
      field === "part_number"
        ? part.part_number
        : field === "stock"
          ? part.stock
          : Object.hasOwn(part.attributes, field)
            ? part.attributes[field]
            : null;
    if ((v === null || v === undefined) && strict)
      throw new RuleEvalError(
        `the ${slotKey} part ${part.part_number ?? ""} has no ${field}`.replace("  ", " "),
      );
    return v ?? null;
  };
  acc.reads.set(label, { label, read: (ctx) => lookup(ctx, false) });
  return { ty: doc!.type, fn: (ctx) => lookup(ctx, true) };
}

function operator(n: Record<string, any>, depth: number, acc: Acc): Checked {
  const node = n as MathNode;
  const fnName = n.fn as string;
  const op = n.op as string;
  if (n.implicit)
    refuse(
      acc,
      "Write an operator between values (implicit multiplication and units are not allowed)",
      node,
    );
  if (n.isPercentage)
    refuse(acc, "Percent signs are not allowed; write the fraction (0.9 for 90 %)", node);
  const args = n.args as MathNode[];
  if (fnName === "pow") {
    const [base, exp] = args as [MathNode, MathNode];
    const isPow = (x: MathNode): boolean =>
      x.type === "ParenthesisNode"
        ? isPow((x as any).content)
        : x.type === "OperatorNode" && (x as any).fn === "pow";
    if (isPow(base) || isPow(exp)) refuse(acc, "Powers cannot be stacked (a ^ b ^ c)", node);
    const e = constantNumber(exp);
    if (e === null || Math.abs(e) > CONDITION_LIMITS.maxExponent)
      refuse(
        acc,
        `The power after ^ must be a plain number between -${CONDITION_LIMITS.maxExponent} and ${CONDITION_LIMITS.maxExponent}`,
        node,
      );
  }
  if (fnName in ARITH && args.length === 2) {
    const [a, b] = args.map((x) =>
      expect(walk(x, depth + 1, acc), "number", x, acc, `${op} works on numbers`),
    );
    const f = ARITH[fnName]!;
    // the texts of possible errors are built once, when the rule is compiled
    const left = "the left side of " + op;
    const right = "the right side of " + op;
    const text = nodeText(node);
    return {
      ty: "number",
      fn: (ctx) => finite(f(num(a!.fn(ctx), left), num(b!.fn(ctx), right)), text),
    };
  }
  if ((fnName === "unaryMinus" || fnName === "unaryPlus") && args.length === 1) {
    const a = expect(
      walk(args[0]!, depth + 1, acc),
      "number",
      args[0]!,
      acc,
      `${op} works on numbers`,
    );
    const sign = fnName === "unaryMinus" ? -1 : 1;
    const text = nodeText(node);
    return { ty: "number", fn: (ctx) => sign * num(a.fn(ctx), text) };
  }
  if (fnName in COMPARE && args.length === 2) {
    const [a, b] = args.map((x) =>
      expect(walk(x, depth + 1, acc), "number", x, acc, `${op} compares numbers`),
    );
    const f = COMPARE[fnName]!;
    const left = "the left side of " + op;
    const right = "the right side of " + op;
    return { ty: "boolean", fn: (ctx) => f(num(a!.fn(ctx), left), num(b!.fn(ctx), right)) };
  }
  if ((fnName === "equal" || fnName === "unequal") && args.length === 2) {
    const [a, b] = args.map((x) => walk(x, depth + 1, acc)) as [Checked, Checked];
    if (a.ty !== b.ty)
      refuse(acc, `${op} compares like with like; here ${a.ty} is compared with ${b.ty}`, node);
    const eq = fnName === "equal";
    return {
      ty: "boolean",
      fn: (ctx) => {
        const x = a.fn(ctx);
        const y = b.fn(ctx);
        if (typeof x !== typeof y)
          throw new RuleEvalError(`${op} compares ${describe(x)} with ${describe(y)}`);
        return (x === y) === eq;
      },
    };
  }
  if ((fnName === "and" || fnName === "or") && args.length === 2) {
    const [a, b] = args.map((x) =>
      expect(walk(x, depth + 1, acc), "boolean", x, acc, `${op} combines true/false values`),
    );
    if (fnName === "and")
      return {
        ty: "boolean",
        fn: (ctx) =>
          bool(a!.fn(ctx), "the left side of and") && bool(b!.fn(ctx), "the right side of and"),
      };
    return {
      ty: "boolean",
      fn: (ctx) =>
        bool(a!.fn(ctx), "the left side of or") || bool(b!.fn(ctx), "the right side of or"),
    };
  }
  if (fnName === "not" && args.length === 1) {
    const a = expect(
      walk(args[0]!, depth + 1, acc),
      "boolean",
      args[0]!,
      acc,
      "not works on true/false",
    );
    return { ty: "boolean", fn: (ctx) => !bool(a.fn(ctx), "the value after not") };
  }
  return refuse(acc, `The operator "${op}" is not allowed in a condition`, node);
}

function constantNumber(node: MathNode): number | null {
  const n = node as any;
  if (n.type === "ParenthesisNode") return constantNumber(n.content);
  if (n.type === "ConstantNode" && typeof n.value === "number") return n.value;
  if (
    n.type === "OperatorNode" &&
    n.fn === "unaryMinus" &&
    n.args[0]?.type === "ConstantNode" &&
    typeof n.args[0].value === "number"
  )
    return -n.args[0].value;
  return null;
}

function expect(c: Checked, ty: Ty, node: MathNode, acc: Acc, why: string): Checked {
  if (c.ty !== ty)
    refuse(
      acc,
      `${why}; ${nodeText(node)} is ${c.ty === "text" ? "text" : c.ty === "boolean" ? "true/false" : "a number"}`,
      node,
    );
  return c;
}

function relational(n: Record<string, any>, depth: number, acc: Acc): Checked {
  const conds = n.conditionals as string[];
  const params = (n.params as MathNode[]).map((p) =>
    expect(walk(p, depth + 1, acc), "number", p, acc, "Chained comparisons compare numbers"),
  );
  const fs = conds.map((c) => {
    const f = COMPARE[c];
    if (!f)
      refuse(
        acc,
        `Chained comparisons may use < <= > >= only, not ${OP_TEXT[c] ?? c}`,
        n as MathNode,
      );
    return f!;
  });
  return {
    ty: "boolean",
    fn: (ctx) => {
      const vals = params.map((p, i) => num(p.fn(ctx), `value ${i + 1} of the comparison`));
      return fs.every((f, i) => f(vals[i]!, vals[i + 1]!));
    },
  };
}

function conditional(n: Record<string, any>, depth: number, acc: Acc): Checked {
  const c = expect(
    walk(n.condition, depth + 1, acc),
    "boolean",
    n.condition,
    acc,
    "The part before ? must be true/false",
  );
  const t = walk(n.trueExpr, depth + 1, acc);
  const f = walk(n.falseExpr, depth + 1, acc);
  if (t.ty !== f.ty) refuse(acc, "Both sides of : must be the same kind of value", n as MathNode);
  return { ty: t.ty, fn: (ctx) => (bool(c.fn(ctx), "the part before ?") ? t.fn(ctx) : f.fn(ctx)) };
}

function call(n: Record<string, any>, depth: number, acc: Acc): Checked {
  const fnNode = n.fn as Record<string, any>;
  const args = n.args as MathNode[];
  if (fnNode.type !== "SymbolNode")
    refuse(
      acc,
      `Only the listed functions can be called (${[...FUNCTION_BY_NAME.keys()].join(", ")}); methods and computed functions are not allowed`,
      n as MathNode,
    );
  const name = fnNode.name as string;
  const doc = FUNCTION_BY_NAME.get(name);
  if (!doc) {
    return refuse(
      acc,
      `"${name.slice(0, 60)}" is not a function fit rules can use; they can use ${[...FUNCTION_BY_NAME.keys()].join(", ")}`,
      undefined,
      name,
    );
  }
  if (args.length < doc.minArgs || args.length > doc.maxArgs)
    refuse(
      acc,
      `${doc.signature} takes ${doc.minArgs === doc.maxArgs ? doc.minArgs : `${doc.minArgs} to ${doc.maxArgs}`} value(s)`,
      n as MathNode,
    );
  acc.functions.add(name);
  const node = n as MathNode;
  if (name === "has" || name === "filled") {
    const arg = args[0] as any;
    if (arg.type !== "ConstantNode" || typeof arg.value !== "string" || arg.value.trim() === "")
      refuse(acc, `${name}( ) takes a word in quotes, e.g. ${doc.signature}`, node);
    if ((arg.value as string).length > CONDITION_LIMITS.maxTextLength)
      refuse(acc, `Text in quotes is limited to ${CONDITION_LIMITS.maxTextLength} characters`, arg);
    const word = (arg.value as string).slice(0, CONDITION_LIMITS.maxTextLength);
    if (name === "filled") {
      if (!SLOT_BY_NAME.has(word))
        refuse(
          acc,
          `"${word.slice(0, 60)}" is not a slot; slots: ${[...SLOT_BY_NAME.keys()].join(", ")}`,
          node,
        );
      const label = `filled("${word}")`;
      const fn = (ctx: EvalContext) => Boolean(ctx.scope.get(word));
      acc.reads.set(label, { label, read: fn });
      return { ty: "boolean", fn };
    }
    const label = `has("${word}")`;
    const fn = (ctx: EvalContext) => snapshotHas(ctx.snapshot, word);
    acc.reads.set(label, { label, read: fn });
    return { ty: "boolean", fn };
  }
  if (name === "known") {
    const arg = args[0]!;
    if (arg.type !== "SymbolNode" && arg.type !== "AccessorNode")
      refuse(acc, "known( ) takes one name, e.g. known(cam.lift_mm)", node);
    const inner = walk(arg, depth + 1, acc);
    return {
      ty: "boolean",
      fn: (ctx) => {
        try {
          inner.fn(ctx);
          return true;
        } catch (e) {
          if (e instanceof RuleEvalError) return false;
          throw e;
        }
      },
    };
  }
  const checked = args.map((a) =>
    expect(walk(a, depth + 1, acc), "number", a, acc, `${name}( ) works on numbers`),
  );
  const vals = (ctx: EvalContext) =>
    checked.map((c, i) => num(c.fn(ctx), `value ${i + 1} of ${name}( )`));
  switch (name) {
    case "min":
      return { ty: "number", fn: (ctx) => Math.min(...vals(ctx)) };
    case "max":
      return { ty: "number", fn: (ctx) => Math.max(...vals(ctx)) };
    case "abs":
      return { ty: "number", fn: (ctx) => Math.abs(vals(ctx)[0]!) };
    case "floor":
      return { ty: "number", fn: (ctx) => Math.floor(vals(ctx)[0]!) };
    case "ceil":
      return { ty: "number", fn: (ctx) => Math.ceil(vals(ctx)[0]!) };
    case "sqrt":
      return {
        ty: "number",
        fn: (ctx) => {
          const x = vals(ctx)[0]!;
          if (x < 0) throw new RuleEvalError(`sqrt( ) of a negative number (${x})`);
          return Math.sqrt(x);
        },
      };
    case "round":
      return {
        ty: "number",
        fn: (ctx) => {
          const [x, d = 0] = vals(ctx);
          if (!Number.isInteger(d) || d < 0 || d > 6)
            throw new RuleEvalError("round( ) keeps 0 to 6 decimal places");
          const f = 10 ** d;
          return Math.round(x! * f) / f;
        },
      };
    default:
      return refuse(acc, `"${name}" is not a function fit rules can use`, node);
  }
}

function analyse(
  text: unknown,
): { ok: true; compiled: CompiledCondition } | Extract<CheckResult, { ok: false }> {
  try {
    if (typeof text !== "string" || text.trim() === "")
      return {
        ok: false,
        message: 'Write a condition, e.g. power_hp > 145 and has("stock-axle-adjusters")',
      };
    if (text.length > CONDITION_LIMITS.maxLength)
      return {
        ok: false,
        message: `The condition is ${text.length} characters long; the limit is ${CONDITION_LIMITS.maxLength}`,
        index: CONDITION_LIMITS.maxLength,
      };
    preScan(text);
    let root: MathNode;
    try {
      root = math.parse(text);
    } catch (e) {
      if (e instanceof RangeError)
        return { ok: false, message: "The condition is nested too deeply to read" };
      const msg = e instanceof Error ? e.message : String(e);
      const ch = /\(char (\d+)\)/.exec(msg);
      const index = ch ? Math.max(0, Number(ch[1]) - 1) : undefined;
      return {
        ok: false,
        message: `The condition could not be read: ${msg.replace(/\s*\(char \d+\)/, "")}`,
        index,
        fragment: index !== undefined ? text.slice(index, index + 12) : undefined,
      };
    }
    const acc: Acc = { names: new Set(), functions: new Set(), reads: new Map(), nodes: 0, text };
    const top = walk(root, 0, acc);
    if (top.ty !== "boolean") {
      return {
        ok: false,
        message: `A condition must come out true or false; this one gives ${top.ty === "text" ? "text" : "a number"}. Compare it, e.g. power_hp > 145`,
        fragment: nodeText(root),
      };
    }
    const test = (ctx: EvalContext) => {
      const v = top.fn(ctx);
      if (typeof v !== "boolean")
        throw new RuleEvalError("the condition did not give true or false");
      return v;
    };
    return {
      ok: true,
      compiled: {
        test,
        reads: [...acc.reads.values()],
        names: [...acc.names],
        functions: [...acc.functions],
      },
    };
  } catch (e) {
    if (e instanceof Refusal) {
      const out: { ok: false; message: string; index?: number; fragment?: string } = {
        ok: false,
        message: e.message,
      };
      if (e.index !== undefined) out.index = e.index;
      if (e.fragment !== undefined) out.fragment = e.fragment;
      return out;
    }
    // the checker never throws: anything unexpected becomes a refusal
    return {
      ok: false,
      message: `The condition could not be checked: ${e instanceof Error ? e.message.slice(0, 200) : "unknown error"}`,
    };
  }
}

/** Checks a condition's text against the allow-list. Never throws. */
export function checkCondition(text: unknown): CheckResult {
  const r = analyse(text);
  return r.ok ? { ok: true, names: r.compiled.names, functions: r.compiled.functions } : r;
}

/** Compiles checked text, or returns the refusal. */
export function compileConditionText(
  text: string,
): { ok: true; compiled: CompiledCondition } | Extract<CheckResult, { ok: false }> {
  return analyse(text);
}
