// What one export may hold. Each limit is checked while the file is read, at the first line that passes it, so a
// hostile or mistaken file is refused before it costs memory in proportion to its size.
export const PARSE_LIMITS = {
  /** Readings over all channels. */
  maxPoints: 5_000_000,
  /** Channels besides time. */
  maxChannels: 96,
  /** A line of 96 channels in scientific notation is about 2 KB; metadata lines are shorter still. */
  maxLineChars: 65_536,
  /** Data rows (at most one per reading) plus a generous metadata block and blank lines. */
  maxLines: 5_010_000,
} as const;
