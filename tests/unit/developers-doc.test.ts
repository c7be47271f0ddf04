// DEVELOPERS.md stays true to the code: every file or folder it names in backticks exists in the repository.
import fs from "node:fs";
import { describe, expect, it } from "vitest";

describe("DEVELOPERS.md", () => {
  it("names only paths that exist", () => {
    const text = fs.readFileSync("DEVELOPERS.md", "utf8");
    const named = [...text.matchAll(/`((?:app|components|lib|parsers|db|tests|fixtures|public|\.ci)\/[^`\s*]+?)`/g)].map((m) => m[1]!.replace(/[:,.]$/, ""));
    expect(named.length).toBeGreaterThan(20);
    // Patterns such as `lib/<feature>/` name a kind of place, not a file; tests/.artifacts/ is made by the browser tests.
    const paths = [...new Set(named)].filter((p) => !p.includes("<") && !p.startsWith("tests/.artifacts"));
    const exists = (p: string) => [p, `${p}.ts`, `${p}.tsx`].some((q) => fs.existsSync(q.replace(/\/$/, "")));
    const missing = paths.filter((p) => !exists(p));
    expect(missing).toEqual([]);
  });
});
