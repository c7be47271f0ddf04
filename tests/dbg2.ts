import { BUILT_IN_MODELS } from "@/lib/kinetics/models";
import { levenbergMarquardt } from "@/lib/kinetics/lm";
const t = Float64Array.from([0, 1, 3, 5, 7, 9, 11, 13, 15].map((m) => m * 60));
const y = Float64Array.from([1.2, 0.905, 0.526, 0.317, 0.2, 0.133, 0.094, 0.071, 0.058]);
const m = BUILT_IN_MODELS["second-order"]!;
const n = t.length, buf = new Float64Array(n);
const prob = { n, p: 2, residuals(p: Float64Array, o: Float64Array) { m.evaluate(t, p, buf); for (let i = 0; i < n; i++) o[i] = buf[i]! - y[i]!; }, jacobian(p: Float64Array, J: Float64Array) { m.jacobian(t, p, J); } };
const s = m.starts(t, y, {})[0]!;
console.log(s);
for (const it of [5, 20, 100, 1000]) { const r = levenbergMarquardt(prob, [s.a0!, s.k!], { maxIterations: it, lower: [-Infinity, 0] }); console.log(it, r.stop, r.ssr, Array.from(r.x)); }
