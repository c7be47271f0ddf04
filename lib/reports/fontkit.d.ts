// The part of fontkit the reports use (glyph coverage of a font file); fontkit ships no type declarations.
declare module "fontkit" {
  interface Font {
    hasGlyphForCodePoint(codePoint: number): boolean;
  }
  export function openSync(path: string): Font;
}
