// Hostile formulas shared by the formula-safety test and the formula benchmark.
/** Formulas that once took seconds to minutes (symbolic simplification, constant sub-expressions) or are simply big. */
export const PATHOLOGICAL_FORMULAS: Array<{ label: string; formula: string }> = [
  { label: "47 characters of +t terms", formula: "a*t" + "+t".repeat(22) },
  { label: "323 characters of +t terms", formula: "a*t" + "+t".repeat(160) },
  { label: "2,000 characters of +t terms", formula: "a*t" + "+t".repeat(998) },
  { label: "a long product", formula: "a*" + Array.from({ length: 300 }, () => "t").join("*") },
  { label: "nested exponentials", formula: "a*" + "exp(".repeat(38) + "-k*t" + ")".repeat(38) },
  { label: "many parameters in one product", formula: Array.from({ length: 12 }, (_, i) => `b${i + 1}`).join("*") + "*t" },
  { label: "powers of powers", formula: "a*t" + "^t".repeat(200) },
  { label: "twelve parameters, each derivative simplified", formula: "(a+b+c+d+e+f)*(g+h+t+j+k+l)" },
  { label: "nested powers of sums", formula: "((a*t+b)^(c*t+d))^((e*t+f)^(g*t+h))" },
];
