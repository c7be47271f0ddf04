// A seeded generator for reproducible synthetic traces (mulberry32 with Box–Muller normals).
export function seededRandom(seed: number): { uniform: () => number; normal: () => number } {
  let a = seed >>> 0;
  const uniform = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare: number | null = null;
  const normal = () => {
    if (spare !== null) {
      const s = spare;
      spare = null;
      return s;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal };
}

export interface Trace {
  label: string;
  t: number[];
  y: number[];
  truth: { a0: number; ainf: number; k: number };
}

/** First-order traces: decays and rises, 1 to 8 half-lives, several noise levels, t in seconds or minutes. */
export function firstOrderTraces(seed: number): Trace[] {
  const rnd = seededRandom(seed);
  const traces: Trace[] = [];
  for (const direction of ["decay", "rise"] as const)
    for (const halfLives of [1, 2, 4, 8])
      for (const noise of [0.002, 0.01, 0.03])
        for (const timeUnit of ["s", "min"] as const) {
          const n = 40 + Math.floor(rnd.uniform() * 120);
          const kPerS = 10 ** (-4 + 2 * rnd.uniform());
          const k = timeUnit === "s" ? kPerS : kPerS * 60;
          const span = (halfLives * Math.LN2) / k;
          const [a0, ainf] = direction === "decay" ? [0.9 + rnd.uniform(), 0.02 + 0.1 * rnd.uniform()] : [0.05 + 0.1 * rnd.uniform(), 0.8 + rnd.uniform()];
          const amp = Math.abs(a0 - ainf);
          const t = Array.from({ length: n }, (_, i) => (span * i) / (n - 1));
          const y = t.map((ti) => ainf + (a0 - ainf) * Math.exp(-k * ti) + noise * amp * rnd.normal());
          traces.push({ label: `${direction} ${halfLives} t½ noise ${noise} t in ${timeUnit}`, t, y, truth: { a0, ainf, k } });
        }
  return traces;
}
