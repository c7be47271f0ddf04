// The part of jstat the engine uses (the package ships no types).
declare module "jstat" {
  interface Dist2 {
    inv(p: number, dof: number): number;
    cdf(x: number, dof: number): number;
  }
  const jStat: {
    studentt: Dist2;
    normal: { cdf(x: number, mean: number, sd: number): number; inv(p: number, mean: number, sd: number): number };
    centralF: { cdf(x: number, d1: number, d2: number): number };
  };
  export default jStat;
}
