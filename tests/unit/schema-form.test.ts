// Forms on the route's own schema (components/forms/schema-form.ts): the values as typed are turned into the body and
// parsed by the schema the route parses, so the form refuses exactly what the route refuses, on the field the issue
// names; formMessages lists them in the form's words.
import { describe, expect, it } from "vitest";
import { bodySchema, formMessages } from "@/components/forms/schema-form";
import { labSettingsSchema, inviteSchema } from "@/lib/schemas/admin";

const settings = bodySchema((v: { days: string; upload: string; pw: string; outside: boolean; reason: string }) => ({ outside_links: v.outside, default_link_days: Number(v.days), upload_limit_mb: Number(v.upload), password_min_length: Number(v.pw), reason: v.reason }), labSettingsSchema);

describe("bodySchema", () => {
  it("gives the route's parsed body for good values", () => {
    expect(settings.parse({ days: "14", upload: "20", pw: "12", outside: true, reason: "partner QA" })).toEqual({ outside_links: true, default_link_days: 14, upload_limit_mb: 20, password_min_length: 12, reason: "partner QA" });
  });

  it("refuses what the route refuses, with the route's message on the body's field", () => {
    const r = settings.safeParse({ days: "0", upload: "20", pw: "8", outside: false, reason: "x" });
    expect(r.success).toBe(false);
    const byPath = Object.fromEntries(r.error!.issues.map((i) => [i.path.join("."), i.message]));
    expect(Object.keys(byPath).sort()).toEqual(["default_link_days", "password_min_length", "reason"]);
    expect(byPath.password_min_length).toBe("Passwords shorter than 10 characters are not allowed here.");
    expect(byPath.reason).toBe("Say why (at least 3 characters).");
    // The route's own parse of the same body says the same.
    const route = labSettingsSchema.safeParse({ outside_links: false, default_link_days: 0, upload_limit_mb: 20, password_min_length: 8, reason: "x" });
    expect(route.error!.issues.map((i) => i.message)).toEqual(r.error!.issues.map((i) => i.message));
  });

  it("the route's transforms apply (an invitation's e-mail trimmed and lower-cased)", () => {
    const invite = bodySchema((v: { email: string; name: string; role: string; days: string }) => ({ ...v, days: Number(v.days) }), inviteSchema);
    expect(invite.parse({ email: "  Pia.Ostrander@Larkspur.EXAMPLE ", name: "Pia", role: "reviewer", days: "7" }).email).toBe("pia.ostrander@larkspur.example");
  });
});

describe("formMessages", () => {
  it("lists nested messages with their field, and the server's own refusal as it said it", () => {
    const errors = { definition: { window: { from_s: { type: "custom", message: "too late" } } }, root: { server: { type: "server", message: "The formula does not converge." } } };
    expect(formMessages(errors as never, "", /^definition\./)).toEqual(["window.from_s: too late", "The formula does not converge."]);
  });
});
