import { z } from "zod";

/** Names and titles are printed in pages, CSV and PDF: control characters (NUL, escapes) are refused. */
export const NO_CONTROL = /^[^\u0000-\u001f\u007f]*$/;
/** A one-line name or title: trimmed, bounded, without control characters. */
export const lineText = (max: number) => z.string().trim().max(max).regex(NO_CONTROL, "Control characters (such as NUL or line breaks) are not allowed here.");

/** Route ids: positive integers written in the path. */
export const idParam = z.coerce.number().int().positive();
