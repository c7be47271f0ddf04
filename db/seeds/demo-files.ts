// The demo scenario's export files (invented data, demo only): Larkspur Stability Services follows the colour loss of
// "corvane blue", a fictional dye, at 590 nm in pH 11 buffer at 25, 30, 40 and 50 °C. Rate constants follow an invented
// Arrhenius line (Ea 82 kJ/mol); each file has two cells with small noise, and the files come in the shapes different
// instruments export, so the demo runs through the real parsers. `npm run demo` writes them to fixtures/demo when
// missing and ingests them through lib/ingest.

const EA = 82_000; // J/mol, invented
const K25 = 1.6e-3; // s^-1 at 25 °C, invented
const R = 8.314462618;

export function demoRateConstant(celsius: number): number {
  const T = celsius + 273.15;
  return K25 * Math.exp((-EA / R) * (1 / T - 1 / 298.15));
}

function rng(seed: number) {
  let a = seed >>> 0;
  const u = () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  return () => Math.sqrt(-2 * Math.log(u() || 1e-12)) * Math.cos(2 * Math.PI * u());
}

function trace(celsius: number, seed: number, n: number, span: number) {
  const k = demoRateConstant(celsius);
  const noise = rng(seed);
  const t = Array.from({ length: n }, (_, i) => (span * i) / (n - 1));
  const cell = (a0: number, ainf: number) => t.map((ti) => ainf + (a0 - ainf) * Math.exp(-k * ti) + 0.0025 * noise());
  return { t, c1: cell(1.02, 0.045), c2: cell(0.98, 0.05) };
}

export function demoFiles(): Array<{ name: string; text: string }> {
  const out: Array<{ name: string; text: string }> = [];
  {
    const { t, c1, c2 } = trace(25, 1, 61, 1800);
    const rows = t.map((ti, i) => `${ti.toFixed(0)},${c1[i]!.toFixed(4)},${c2[i]!.toFixed(4)}`);
    out.push({
      name: "corvane-blue-25C.csv",
      text: ["# Larkspur Stability Services - demo export (invented data)", "Sample: corvane blue, lot DEMO-7", "Wavelength: 590 nm", "Path length: 1 cm", "Temperature: 25.0 C", "Operator: A. Quist", "", "Time (s),Cell 1 (A),Cell 2 (A)", ...rows].join("\n") + "\n",
    });
  }
  {
    const { t, c1, c2 } = trace(30, 2, 61, 1200);
    const dc = (v: number) => v.toFixed(4).replace(".", ",");
    const rows = t.map((ti, i) => `${(ti / 60).toFixed(2).replace(".", ",")};${dc(c1[i]!)};${dc(c2[i]!)}`);
    out.push({
      name: "corvane-blue-30C.csv",
      text: ["Probe;Corvane blue DEMO-7", "Wavelength;590 nm", "Path length;10 mm", "Temperature;30,0 °C", "", "Time (min);Cell 1;Cell 2", ...rows].join("\n") + "\n",
    });
  }
  {
    const { t, c1, c2 } = trace(40, 3, 61, 480);
    const mmss = (s: number) => `${String(Math.floor(s / 60)).padStart(2, "0")}:${String(Math.round(s % 60)).padStart(2, "0")}`;
    const rows = t.map((ti, i) => `${mmss(ti)}\t${(100 * 10 ** -c1[i]!).toFixed(3)}\t${(100 * 10 ** -c2[i]!).toFixed(3)}`);
    out.push({
      name: "corvane-blue-40C.txt",
      text: ["# demo export, transmittance mode (invented data)", "Wavelength (nm)\t590", "Temperature\t40.0 °C", "", "Time\t%T Cell 1\t%T Cell 2", ...rows].join("\n") + "\n",
    });
  }
  {
    const { t, c1 } = trace(50, 4, 61, 200);
    const rows = [];
    for (let i = 0; i < t.length; i += 3) rows.push(t.slice(i, i + 3).map((ti, j) => `${ti.toFixed(2)}, ${Math.round(c1[i + j]! * 10000)}`).join("; "));
    out.push({
      name: "corvane-blue-50C.jdx",
      text: [
        "##TITLE= Corvane blue DEMO-7, 50 C",
        "##JCAMP-DX= 5.01",
        "##DATA TYPE= UV/VIS KINETICS",
        "##ORIGIN= Larkspur Stability Services (demo, invented data)",
        "##OWNER= demo",
        "##.OBSERVE WAVELENGTH= 590",
        "##PATH LENGTH= 1",
        "##TEMPERATURE= 50",
        "##XUNITS= SECONDS",
        "##YUNITS= ABSORBANCE",
        "##XFACTOR= 1",
        "##YFACTOR= 0.0001",
        `##NPOINTS= ${t.length}`,
        "##XYPOINTS= (XY..XY)",
        ...rows,
        "##END=",
      ].join("\n") + "\n",
    });
  }
  {
    // Cell 2 of a 25 °C repeat drifts: its baseline creeps up (a film forming on the window), so A∞ is not constant and the
    // linearized fit, with A∞ taken from the early plateau estimate, disagrees visibly with the nonlinear fit.
    const { t, c1 } = trace(25, 5, 61, 2400);
    const rows = t.map((ti, i) => `${ti.toFixed(0)},${(c1[i]! + 6e-5 * ti).toFixed(4)}`);
    out.push({
      name: "corvane-blue-25C-repeat-drift.csv",
      text: ["# Larkspur Stability Services - demo export (invented data); cell window fouling suspected", "Wavelength: 590 nm", "Path length: 1 cm", "Temperature: 25.0 C", "", "Time (s),Cell 2 (A)", ...rows].join("\n") + "\n",
    });
  }
  return out;
}
