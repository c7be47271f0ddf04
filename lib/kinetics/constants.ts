// Exact SI constants (SI 2019 / CODATA 2018). R = NA * kB.
export const PLANCK_H = 6.62607015e-34; // J s
export const BOLTZMANN_KB = 1.380649e-23; // J/K
export const AVOGADRO_NA = 6.02214076e23; // 1/mol
export const GAS_R = AVOGADRO_NA * BOLTZMANN_KB; // 8.314462618... J/(mol K)
export const KELVIN_OFFSET = 273.15;
export const LN_KB_OVER_H = Math.log(BOLTZMANN_KB / PLANCK_H);
export const ENGINE_VERSION = "halflight-kinetics 0.1.0";
