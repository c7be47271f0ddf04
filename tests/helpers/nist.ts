// The NIST StRD readers live with the built-in validation run; the tests use the same ones.
export { lre, nistData, nistFormulaAsT, nistIndex, type NistDataset } from "@/lib/validation/nist";
