// The delimited-text parser: CSV, semicolon, tab or whitespace separated exports.
import { ParseError, type ExportParser } from "../types";
import { parseDelimitedText } from "./parse";

export const delimitedParser: ExportParser = {
  name: "delimited",
  sniff(bytes, fileName) {
    if (bytes.length === 0) return 0;
    const head = new TextDecoder("utf-8").decode(bytes.subarray(0, 4096));
    if (/^\s*##(TITLE|JCAMP)/i.test(head)) return 0.05;
    const ext = fileName.toLowerCase().split(".").pop() ?? "";
    const base = ["csv", "tsv", "txt", "dat", "asc", "prn"].includes(ext) ? 0.6 : 0.3;
    return /[,;\t]/.test(head) || /\d\s+\d/.test(head) ? base + 0.2 : base;
  },
  parse(bytes, _fileName, options) {
    try {
      return parseDelimitedText(bytes, options);
    } catch (e) {
      if (e instanceof ParseError) return e;
      throw e;
    }
  },
};
