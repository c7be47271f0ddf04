// User formulas in standard math notation (mathjs): y as an expression of t; every other free name is a parameter.
// Hostile input is bounded before any work: length, node count and depth are checked on the parsed tree, and only an
// allow-list of node kinds, operators and functions passes (no evaluate, import, createUnit, ranges, matrices,
// assignments or property access). Derivatives are symbolic without mathjs's simplification step (whose cost grows
// exponentially with the formula), for small trees only; larger trees and points where a symbolic derivative is not
// finite (0·log 0 at t = 0) use central differences.
import type * as MathJs from "mathjs";
import type { EvalFunction, MathNode } from "mathjs";

// mathjs is loaded only when a formula is first read (it costs most of a second to load, and most fits need none):
// under Node from node_modules on first use; a browser bundle hands it over with `provideMathjs` where it fits.
let mathjsModule: typeof MathJs | null = null;

/** Gives the formula engine its mathjs (the browser's fitting worker and page do this once). */
export function provideMathjs(m: typeof MathJs): void {
  mathjsModule = m;
}

function mathjs(): typeof MathJs {
  if (mathjsModule) return mathjsModule;
  const node = (globalThis as { process?: { getBuiltinModule?: (id: string) => { createRequire(path: string): (id: string) => unknown } | undefined; cwd?: () => string } }).process;
  const mod = node?.getBuiltinModule?.("node:module");
  if (mod && node?.cwd) {
    mathjsModule = mod.createRequire(`${node.cwd()}/`)("mathjs") as typeof MathJs;
    return mathjsModule;
  }
  throw new Error("The formula engine is not loaded on this page; reload it.");
}

/** Longest formula read at all. */
export const MAX_FORMULA_LENGTH = 2000;
/** Largest parsed tree (nodes) and nesting depth accepted. */
export const MAX_FORMULA_NODES = 600;
export const MAX_FORMULA_DEPTH = 40;
/** Deepest parsed tree: a long sum is a deep tree (each + one level), so this is wider than the bracket depth. */
const MAX_TREE_DEPTH = 1200;
/** Trees up to this size get symbolic derivatives; larger ones use central differences. */
const SYMBOLIC_DERIVATIVE_NODES = 120;
/** mathjs's full simplification (rule rewriting, exponential in the length of a sum) only on derivatives this small,
 * with sums and products of at most SIMPLIFY_CHAIN operands (a rule of size, never of time, so a formula always gets
 * the same derivatives); the rest keep the pruned form. Simplified forms round less (NIST Bennett5: LRE 8.5 against 6.9). */
const SIMPLIFY_NODES = 60;
const SIMPLIFY_CHAIN = 6;
const MAX_PARAMETERS = 12;

const KNOWN_CONSTANTS = new Set(["pi", "e", "E", "PI"]);
/** Functions a kinetic formula may use; each has a derivative in mathjs. */
export const FORMULA_FUNCTIONS = ["exp", "log", "log10", "sqrt", "abs", "sin", "cos", "tan", "sinh", "cosh", "tanh", "asin", "acos", "atan"] as const;
const FUNCTIONS = new Set<string>(FORMULA_FUNCTIONS);
const OPERATORS = new Set(["add", "subtract", "multiply", "divide", "pow", "unaryMinus", "unaryPlus"]);
const NODE_KINDS = new Set(["ConstantNode", "SymbolNode", "OperatorNode", "ParenthesisNode", "FunctionNode"]);
const NAME = /^[A-Za-z][A-Za-z0-9_]{0,31}$/;

export interface CompiledFormula {
  expression: string;
  params: string[];
  evaluate(t: Float64Array, p: ArrayLike<number>, out: Float64Array): void;
  jacobian(t: Float64Array, p: ArrayLike<number>, J: Float64Array): void;
}

export class FormulaError extends Error {
  override name = "FormulaError";
}

interface Checked {
  text: string;
  node: MathNode;
  params: string[];
  size: number;
}

/** Reads and checks a formula without compiling it: every refusal names what was refused. */
export function checkFormula(source: string, variable = "t"): Checked {
  if (source.length > MAX_FORMULA_LENGTH) throw new FormulaError(`The formula has ${source.length} characters; at most ${MAX_FORMULA_LENGTH} are read.`);
  let text = source.trim().replace(/\*\*/g, "^");
  // Accept "y = ..." as written in papers; the left side is ignored.
  const eq = text.match(/^\s*[A-Za-z_]\w*\s*=(?!=)(.*)$/);
  if (eq) text = eq[1]!.trim();
  if (!text) throw new FormulaError("The formula is empty.");
  // Parenthesis depth bounds the parser's own recursion before it runs.
  let depth = 0;
  for (const ch of text) {
    if (ch === "(" || ch === "[" || ch === "{") depth++;
    else if (ch === ")" || ch === "]" || ch === "}") depth--;
    if (depth > MAX_FORMULA_DEPTH) throw new FormulaError(`The formula nests brackets more than ${MAX_FORMULA_DEPTH} deep.`);
  }
  let node: MathNode;
  try {
    node = mathjs().parse(text);
  } catch (e) {
    throw new FormulaError(`The formula cannot be read: ${(e as Error).message}`);
  }
  const names = new Set<string>();
  const refused = new Set<string>();
  let size = 0;
  const walk = (n: MathNode, level: number): void => {
    size++;
    if (size > MAX_FORMULA_NODES) throw new FormulaError(`The formula has more than ${MAX_FORMULA_NODES} terms and operations; write it shorter.`);
    if (level > MAX_TREE_DEPTH) throw new FormulaError(`The formula nests more than ${MAX_TREE_DEPTH} levels deep.`);
    if (!NODE_KINDS.has(n.type)) {
      refused.add(describeNode(n));
      return;
    }
    const a = n as unknown as { name?: string; fn?: MathNode | string; op?: string; args?: MathNode[]; content?: MathNode; value?: unknown };
    if (n.type === "ConstantNode") {
      if (typeof a.value !== "number") refused.add(`the constant ${JSON.stringify(String(a.value)).slice(0, 40)} (only numbers)`);
      return;
    }
    if (n.type === "SymbolNode") {
      const name = a.name!;
      if (!NAME.test(name)) refused.add(`the name "${name.slice(0, 40)}"`);
      else if (FUNCTIONS.has(name)) refused.add(`"${name}" without brackets`);
      else names.add(name);
      return;
    }
    if (n.type === "OperatorNode") {
      if (!OPERATORS.has(a.fn as string)) refused.add(`the operator "${a.op}"`);
    } else if (n.type === "FunctionNode") {
      const fn = a.fn as MathNode;
      const fname = fn.type === "SymbolNode" ? (fn as unknown as { name: string }).name : null;
      if (!fname || !FUNCTIONS.has(fname)) refused.add(fname ? `the function "${fname.slice(0, 40)}"` : "a computed function call");
      else if (a.args!.length !== 1) refused.add(`"${fname}" with ${a.args!.length} arguments (it takes one)`);
    }
    for (const c of a.args ?? []) walk(c, level + 1);
    if (a.content) walk(a.content, level + 1);
  };
  walk(node, 0);
  if (refused.size)
    throw new FormulaError(
      `The formula uses ${[...refused].slice(0, 5).join(", ")}, which ${refused.size === 1 ? "is" : "are"} not allowed. A formula may use numbers, t, parameter names, + − × / ^, brackets and ${FORMULA_FUNCTIONS.join(", ")}.`,
    );
  if (!names.has(variable)) throw new FormulaError(`The formula does not use the time variable "${variable}".`);
  const params = [...names].filter((n) => n !== variable && !KNOWN_CONSTANTS.has(n)).sort(naturalOrder);
  if (params.length === 0) throw new FormulaError("The formula has no parameters to fit.");
  if (params.length > MAX_PARAMETERS) throw new FormulaError(`The formula has ${params.length} parameters; at most ${MAX_PARAMETERS} can be fitted.`);
  return { text, node, params, size };
}

function describeNode(n: MathNode): string {
  switch (n.type) {
    case "AssignmentNode":
    case "FunctionAssignmentNode":
      return "an assignment";
    case "AccessorNode":
    case "IndexNode":
      return "an index or property access";
    case "ArrayNode":
    case "ObjectNode":
      return "a matrix or object";
    case "RangeNode":
      return "a range (:)";
    case "RelationalNode":
      return "a comparison";
    case "ConditionalNode":
      return "a condition (? :)";
    case "BlockNode":
      return "several statements";
    default:
      return `a ${n.type.replace(/Node$/, "").toLowerCase()}`;
  }
}

export function compileFormula(source: string, variable = "t"): CompiledFormula {
  const { text, node, params, size } = checkFormula(source, variable);
  let f: EvalFunction;
  let d: EvalFunction[] | null = null;
  try {
    f = node.compile();
    if (size <= SYMBOLIC_DERIVATIVE_NODES) {
      d = params.map((p) => {
        let dp = prune(mathjs().derivative(node, p, { simplify: false }));
        if (simplifiable(dp)) dp = mathjs().simplify(dp);
        return dp.compile();
      });
    }
  } catch (e) {
    throw new FormulaError(`The formula cannot be compiled: ${(e as Error).message}`);
  }
  const scope = new Map<string, number>();
  const bind = (p: ArrayLike<number>) => params.forEach((name, j) => scope.set(name, p[j]!));
  const num = (v: unknown): number => (typeof v === "number" ? v : NaN);
  const at = (ti: number): number => {
    scope.set(variable, ti);
    return num(f.evaluate(scope));
  };
  /** Central difference in parameter j at one time, the others as bound. */
  const difference = (ti: number, p: ArrayLike<number>, j: number): number => {
    const name = params[j]!;
    const v = p[j]!;
    const h = 1e-6 * Math.max(Math.abs(v), 1e-6);
    scope.set(name, v + h);
    const up = at(ti);
    scope.set(name, v - h);
    const down = at(ti);
    scope.set(name, v);
    return (up - down) / (2 * h);
  };
  return {
    expression: text,
    params,
    evaluate(t, p, out) {
      bind(p);
      for (let i = 0; i < t.length; i++) out[i] = at(t[i]!);
    },
    jacobian(t, p, J) {
      bind(p);
      const n = t.length;
      for (let i = 0; i < n; i++) {
        scope.set(variable, t[i]!);
        for (let j = 0; j < params.length; j++) {
          let v = d ? num(d[j]!.evaluate(scope)) : NaN;
          if (!Number.isFinite(v)) v = difference(t[i]!, p, j);
          J[j * n + i] = v;
        }
      }
    },
  };
}

const isConst = (n: MathNode, v?: number): boolean =>
  n.type === "ConstantNode" && typeof (n as unknown as { value: unknown }).value === "number" && (v === undefined || (n as unknown as { value: number }).value === v);
const valueOf = (n: MathNode): number => (n as unknown as { value: number }).value;

/**
 * One bottom-up pass that drops the zeros and ones an unsimplified derivative is full of (x + 0, 0·x, 1·x, x^1, −0)
 * and folds constant operations: linear in the tree's size (mathjs's simplifyCore is not: 2.3 s on the derivative of
 * a 47-character sum).
 */
export function prune(node: MathNode): MathNode {
  const a = node as unknown as { type: string; op: string; fn: string; args: MathNode[]; content: MathNode };
  // Brackets only shape the printed form: the tree already holds the order of operations.
  if (node.type === "ParenthesisNode") return prune(a.content);
  const { ConstantNode, FunctionNode, OperatorNode } = mathjs();
  if (node.type === "FunctionNode") return new FunctionNode((node as unknown as { fn: MathNode }).fn as never, a.args.map(prune));
  if (node.type !== "OperatorNode") return node;
  const args = a.args.map(prune);
  const C = (v: number) => new ConstantNode(v);
  const O = (op: string, fn: string, xs: MathNode[]) => new OperatorNode(op as never, fn as never, xs);
  if (args.length === 1) {
    const [x] = args as [MathNode];
    if (a.fn === "unaryPlus") return x;
    if (a.fn === "unaryMinus") {
      if (isConst(x)) return C(-valueOf(x));
      const inner = x as unknown as { type: string; fn: string; args: MathNode[] };
      if (inner.type === "OperatorNode" && inner.fn === "unaryMinus") return inner.args[0]!;
    }
    return O(a.op, a.fn, [x]);
  }
  const [x, y] = args as [MathNode, MathNode];
  if (isConst(x) && isConst(y) && ["add", "subtract", "multiply", "divide"].includes(a.fn)) {
    const u = valueOf(x),
      v = valueOf(y);
    const r = a.fn === "add" ? u + v : a.fn === "subtract" ? u - v : a.fn === "multiply" ? u * v : u / v;
    if (Number.isFinite(r)) return C(r);
  }
  switch (a.fn) {
    case "add":
      if (isConst(x, 0)) return y;
      if (isConst(y, 0)) return x;
      break;
    case "subtract":
      if (isConst(y, 0)) return x;
      if (isConst(x, 0)) return O("-", "unaryMinus", [y]);
      break;
    case "multiply":
      if (isConst(x, 0) || isConst(y, 0)) return C(0);
      if (isConst(x, 1)) return y;
      if (isConst(y, 1)) return x;
      break;
    case "divide":
      if (isConst(x, 0)) return C(0);
      if (isConst(y, 1)) return x;
      break;
    case "pow":
      if (isConst(y, 1)) return x;
      if (isConst(y, 0)) return C(1);
      break;
  }
  return O(a.op, a.fn, args);
}

/** Small, with no long chains of + or ×: mathjs's simplify is cheap on it. */
function simplifiable(node: MathNode): boolean {
  let size = 0;
  let longest = 0;
  node.traverse((n) => {
    size++;
    if (n.type === "OperatorNode") {
      const fn = (n as unknown as { fn: string }).fn;
      if (fn === "add" || fn === "multiply" || fn === "subtract") longest = Math.max(longest, chainLength(n, fn));
    }
  });
  return size <= SIMPLIFY_NODES && longest <= SIMPLIFY_CHAIN;
}

function chainLength(n: MathNode, fn: string): number {
  const a = n as unknown as { type: string; fn?: string; args?: MathNode[]; content?: MathNode };
  if (a.type === "ParenthesisNode") return chainLength(a.content!, fn);
  if (a.type !== "OperatorNode" || a.fn !== fn || a.args!.length !== 2) return 1;
  return a.args!.reduce((s, c) => s + chainLength(c, fn), 0);
}

/** b1, b2, ..., b10 in numeric order rather than text order. */
function naturalOrder(a: string, b: string): number {
  return a.localeCompare(b, "en", { numeric: true });
}
