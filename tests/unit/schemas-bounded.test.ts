// Every request body's schema is strict (an unknown key is refused, never stored or copied into the audit trail) and
// bounded (strings, arrays and records have a maximum), and names and titles refuse control characters. Common
// practice for input validation (OWASP Input Validation Cheat Sheet: allow-list, bound length).
import { describe, expect, it } from "vitest";
import type { z } from "zod";
import { acceptInvitationSchema, createApiKeySchema, inviteSchema, labSettingsSchema } from "@/lib/schemas/admin";
import { saveFitSchema } from "@/lib/schemas/fits";
import { memberActionSchema } from "@/lib/schemas/members";
import { assignMethodSchema, createCalibrationSchema, createMethodSchema, customModelSchema } from "@/lib/schemas/methods";
import { commentSchema, decisionSchema, submitSchema, withdrawSchema } from "@/lib/schemas/reviews";
import { runMappingSchema } from "@/lib/schemas/runs";
import { createShareSchema } from "@/lib/schemas/sharing";
import { changeStudySchema, createStudySchema } from "@/lib/schemas/studies";

const method = { name: "Blue fade", analyte: "dye" };
const study = { name: "Arrhenius", members: [{ fitId: 1 }, { fitId: 2 }] };
const calibration = { name: "Curve", analyte: "dye", standards: [0, 1, 2].map((c) => ({ concentration: c, absorbance: c / 10 })) };
const valid: Array<[string, z.ZodType, Record<string, unknown>]> = [
  ["lab settings", labSettingsSchema, { outside_links: false, default_link_days: 7, upload_limit_mb: 10, password_min_length: 12, reason: "tighter" }],
  ["invitation", inviteSchema, { email: "a@example.org", name: "A. Person", role: "analyst" }],
  ["invitation acceptance", acceptInvitationSchema, { password: "long enough password" }],
  ["API key", createApiKeySchema, { name: "Bench 1" }],
  ["fit", saveFitSchema, { runId: 1, seriesId: 1, options: { models: ["first-order"] } }],
  ["member action", memberActionSchema, { action: "unlock", reason: "called" }],
  ["method", createMethodSchema, { definition: method }],
  ["calibration", createCalibrationSchema, calibration],
  ["method assignment", assignMethodSchema, { methodId: 1, reason: "right one" }],
  ["submission", submitSchema, { password: "pw" }],
  ["decision", decisionSchema, { decision: "approved", password: "pw" }],
  ["withdrawal", withdrawSchema, { reason: "mistake" }],
  ["comment", commentSchema, { body: "Looks fine." }],
  ["run mapping", runMappingSchema, { run: { name: "Run 1" } }],
  ["share link", createShareSchema, { days: 3 }],
  ["study", createStudySchema, study],
  ["study change", changeStudySchema, { reason: "one more run" }],
];

describe("strict: an unknown key is refused", () => {
  for (const [name, schema, body] of valid)
    it(name, () => {
      expect(schema.safeParse(body).success).toBe(true);
      const r = schema.safeParse({ ...body, lab_id: 2 });
      expect(r.success).toBe(false);
      expect(JSON.stringify(r.error!.issues)).toMatch(/lab_id/);
    });
  it("nested objects too: a method's concentration, a run's fields, a study member", () => {
    expect(createMethodSchema.safeParse({ definition: { ...method, concentration: { kind: "none", extra: 1 } } }).success).toBe(false);
    expect(runMappingSchema.safeParse({ run: { name: "x", lab_id: 2 } }).success).toBe(false);
    expect(createStudySchema.safeParse({ ...study, members: [{ fitId: 1, x: 1 }, { fitId: 2 }] }).success).toBe(false);
  });
});

describe("bounded", () => {
  it("a custom model takes at most 12 start values, with parameter-like names", () => {
    const starts = Object.fromEntries(Array.from({ length: 13 }, (_, i) => [`p${i}`, 1]));
    expect(customModelSchema.safeParse({ name: "m", formula: "a*exp(-k*t)", starts }).success).toBe(false);
    expect(customModelSchema.safeParse({ name: "m", formula: "a*exp(-k*t)", starts: { "__proto__x": 1 } }).success).toBe(false);
  });
  it("run mappings: at most 96 channels, bounded names", () => {
    expect(runMappingSchema.safeParse({ channels: Array.from({ length: 97 }, (_, i) => ({ source: `c${i}` })) }).success).toBe(false);
    expect(runMappingSchema.safeParse({ timeColumn: "t".repeat(201) }).success).toBe(false);
  });
  it("passwords at a signing prompt are bounded before they reach the hash", () => {
    expect(submitSchema.safeParse({ password: "x".repeat(257) }).success).toBe(false);
  });
});

describe("names and titles refuse control characters", () => {
  const nul = "Blue\u0000fade";
  it.each([
    ["method", () => createMethodSchema.safeParse({ definition: { ...method, name: nul } })],
    ["calibration", () => createCalibrationSchema.safeParse({ ...calibration, name: nul })],
    ["study", () => createStudySchema.safeParse({ ...study, name: "Arr\u001bhenius" })],
    ["run", () => runMappingSchema.safeParse({ run: { name: "Run\n2" } })],
    ["API key", () => createApiKeySchema.safeParse({ name: "Bench\u0007" })],
    ["invitee", () => inviteSchema.safeParse({ email: "a@example.org", name: "A\u0000", role: "analyst" })],
  ])("%s", (_, parse) => {
    const r = parse();
    expect(r.success).toBe(false);
    expect(JSON.stringify(r.error!.issues)).toMatch(/Control characters/);
  });
});
