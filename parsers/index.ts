// The parser registry: each parser says how confident it is that it can read a file; the most confident reads it,
// unless the caller names one.
import { delimitedParser } from "./delimited";
import { jcampParser } from "./jcamp";
import { ParseError, type ExportParser, type ParsedExport, type ParseOptions } from "./types";

export * from "./types";

export const PARSERS: readonly ExportParser[] = [delimitedParser, jcampParser];

export function rankParsers(bytes: Uint8Array, fileName: string): Array<{ parser: ExportParser; confidence: number }> {
  return PARSERS.map((parser) => ({ parser, confidence: parser.sniff(bytes, fileName) })).sort((a, b) => b.confidence - a.confidence);
}

export function parseExport(bytes: Uint8Array, fileName: string, parserName?: string, options?: ParseOptions): ParsedExport | ParseError {
  if (bytes.length === 0) return new ParseError("The file is empty.");
  if (parserName) {
    const p = PARSERS.find((x) => x.name === parserName);
    if (!p) return new ParseError(`There is no parser "${parserName}" (parsers: ${PARSERS.map((x) => x.name).join(", ")}).`);
    return p.parse(bytes, fileName, options);
  }
  const [best] = rankParsers(bytes, fileName);
  if (!best || best.confidence <= 0) return new ParseError("No parser recognises this file.");
  return best.parser.parse(bytes, fileName, options);
}
