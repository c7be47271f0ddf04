// The reports' fonts: the app's own typefaces in a form pdfkit embeds (Source Sans 3 as TTF from the `source-sans`
// package, IBM Plex Mono as WOFF from `@ibm/plex-mono`; pdfkit's font subsetter fails on the app's WOFF2 files), so
// s⁻¹, °C, ±, µ, A∞ and Greek print as on screen. A character the font lacks (a name in a script it does not cover)
// prints as "?" rather than as a wrong glyph, and mono is used only for plain ASCII (hashes, codes).
import fs from "node:fs";
import path from "node:path";
import type { openSync } from "fontkit";

const ROOT = path.join(process.cwd(), "node_modules");
export const PDF_FONTS = {
  sans: path.join(ROOT, "source-sans", "TTF", "SourceSans3-Regular.ttf"),
  bold: path.join(ROOT, "source-sans", "TTF", "SourceSans3-Bold.ttf"),
  mono: path.join(ROOT, "@ibm", "plex-mono", "fonts", "complete", "woff", "IBMPlexMono-Regular.woff"),
} as const;
export type PdfFont = keyof typeof PDF_FONTS;

let coverage: ReturnType<typeof openSync> | null = null;
function sansCoverage() {
  if (!coverage) throw new Error("printable() before openPdfDocument(): the report fonts are not loaded.");
  return coverage;
}

/** Text for the sans faces: control characters dropped, characters outside the font as "?". */
export function printable(s: string): string {
  const f = sansCoverage();
  let out = "";
  for (const ch of s.replace(/[\u0000-\u0008\u000b-\u001f\u007f]/g, "")) out += ch === "\n" || ch === "\t" || f.hasGlyphForCodePoint(ch.codePointAt(0)!) ? ch : "?";
  return out;
}

/**
 * A new A4 pdfkit document with the three faces registered, and its bytes once ended. pdfkit and fontkit load on the
 * first report (the job worker starts without them).
 */
export async function openPdfDocument(options: { margin: number; info: Record<string, string> }) {
  const [{ default: PDFDocument }, fontkit] = await Promise.all([import("pdfkit"), import("fontkit")]);
  coverage ??= fontkit.openSync(PDF_FONTS.sans);
  const doc = new PDFDocument({ size: "A4", ...options });
  const chunks: Buffer[] = [];
  doc.on("data", (c: Buffer) => chunks.push(c));
  const bytes = new Promise<Uint8Array>((resolve) => doc.on("end", () => resolve(Buffer.concat(chunks))));
  registerPdfFonts(doc);
  return { doc, bytes };
}

/** Registers the three faces on a pdfkit document; throws a clear error when a font file is missing. */
function registerPdfFonts(doc: { registerFont(name: string, src: string): unknown }): void {
  for (const [name, file] of Object.entries(PDF_FONTS)) {
    if (!fs.existsSync(file)) throw new Error(`The report font ${file} is missing: run npm install (source-sans and @ibm/plex-mono are dependencies).`);
    doc.registerFont(name, file);
  }
}

/** Mono only for plain ASCII; anything else in the sans face so it prints. */
export function faceFor(kind: PdfFont, text: string): PdfFont {
  return kind === "mono" && /[^\x20-\x7e]/.test(text) ? "sans" : kind;
}
