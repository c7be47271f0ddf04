// `npm run bench`: benchmarks with figures and ratios against named peers run side by side (never timed tests).
import { benchEngine } from "./engine";

console.log(`Halflight benchmarks on Node ${process.version}, ${process.platform}/${process.arch}`);
benchEngine();
