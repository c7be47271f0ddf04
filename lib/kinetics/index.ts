// The kinetics engine: pure, synchronous numerics. The UI, the CLI, reports and tests all call it; nothing else
// re-implements its formulas.
export * from "./constants";
export * from "./criteria";
export * from "./diagnostics";
export * from "./fit";
export * from "./formula";
export * from "./global";
export * from "./linearized";
export * from "./lm";
export * from "./models";
export * from "./nls";
export * from "./quantities";
export * from "./regression";
export * from "./stats";
export * from "./temperature";
export * from "./types";
export * from "./workspace";
