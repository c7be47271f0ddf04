// User formulas in standard math notation (mathjs): y as an expression of t; every other free name is a parameter.
// The Jacobian comes from mathjs's symbolic derivatives, compiled once.
import { compile, derivative, parse, type EvalFunction, type MathNode } from "mathjs";

const KNOWN_CONSTANTS = new Set(["pi", "e", "E", "PI", "Infinity", "NaN"]);

export interface CompiledFormula {
  expression: string;
  params: string[];
  evaluate(t: Float64Array, p: ArrayLike<number>, out: Float64Array): void;
  jacobian(t: Float64Array, p: ArrayLike<number>, J: Float64Array): void;
}

export class FormulaError extends Error {
  override name = "FormulaError";
}

export function compileFormula(source: string, variable = "t"): CompiledFormula {
  let text = source.trim().replace(/\*\*/g, "^");
  // Accept "y = ..." as written in papers; the left side is ignored.
  const eq = text.match(/^\s*[A-Za-z_]\w*\s*=(?!=)(.*)$/);
  if (eq) text = eq[1]!.trim();
  let node: MathNode;
  try {
    node = parse(text);
  } catch (e) {
    throw new FormulaError(`The formula cannot be read: ${(e as Error).message}`);
  }
  const names = new Set<string>();
  const functions = new Set<string>();
  node.traverse((n, _path, parent) => {
    if (n.type === "SymbolNode") {
      const name = (n as unknown as { name: string }).name;
      const isFn = parent?.type === "FunctionNode" && (parent as unknown as { fn: MathNode }).fn === n;
      if (isFn) functions.add(name);
      else names.add(name);
    }
  });
  if (!names.has(variable)) throw new FormulaError(`The formula does not use the time variable "${variable}".`);
  const params = [...names].filter((n) => n !== variable && !KNOWN_CONSTANTS.has(n)).sort(naturalOrder);
  if (params.length === 0) throw new FormulaError("The formula has no parameters to fit.");

  let f: EvalFunction;
  let d: EvalFunction[];
  try {
    f = compile(text);
    d = params.map((p) => derivative(node, p).compile());
  } catch (e) {
    throw new FormulaError(`The formula cannot be differentiated: ${(e as Error).message}`);
  }
  const scope: Record<string, number> = {};
  const bind = (p: ArrayLike<number>) => params.forEach((name, j) => (scope[name] = p[j]!));
  const num = (v: unknown): number => (typeof v === "number" ? v : Number(v));
  return {
    expression: text,
    params,
    evaluate(t, p, out) {
      bind(p);
      for (let i = 0; i < t.length; i++) {
        scope[variable] = t[i]!;
        out[i] = num(f.evaluate(scope));
      }
    },
    jacobian(t, p, J) {
      bind(p);
      const n = t.length;
      for (let i = 0; i < n; i++) {
        scope[variable] = t[i]!;
        for (let j = 0; j < params.length; j++) J[j * n + i] = num(d[j]!.evaluate(scope));
      }
    },
  };
}

/** b1, b2, ..., b10 in numeric order rather than text order. */
function naturalOrder(a: string, b: string): number {
  return a.localeCompare(b, "en", { numeric: true });
}
