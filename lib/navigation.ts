// The workspace's areas: one list feeds the navigation, the pages' permission checks and the browser tests.
import type { Permission } from "@/lib/permissions";

export interface Area {
  href: string;
  label: string;
  permission: Permission;
  /** What will live here, said plainly on the area's empty state. */
  purpose: string;
}

export const AREAS: readonly Area[] = [
  {
    href: "/runs",
    label: "Runs",
    permission: "run:read",
    purpose:
      "Every spectrophotometer export you upload becomes a run: the untouched file (with its SHA-256), its channels as time series, and the instrument details read from it.",
  },
  {
    href: "/fits",
    label: "Fits",
    permission: "fit:read",
    purpose:
      "Kinetic fits of a run's channels: the linearized first-order fit beside the nonlinear exponential fit, with residuals, standard errors and confidence intervals. Each saved fit is a versioned record.",
  },
  {
    href: "/studies",
    label: "Temperature studies",
    permission: "study:read",
    purpose:
      "Rate constants from runs at several temperatures, brought together for the activation energy (Arrhenius) and the Eyring parameters, each with its uncertainty.",
  },
  {
    href: "/reviews",
    label: "Review queue",
    permission: "review:read",
    purpose:
      "Fit records submitted for review. Open one, comment, and approve or reject it with your electronic signature. You never review your own work.",
  },
  {
    href: "/methods",
    label: "Methods",
    permission: "method:read",
    purpose:
      "The lab's method templates: wavelength, molar absorptivity or calibration curve, path length, default model, weighting and acceptance criteria.",
  },
  {
    href: "/admin/members",
    label: "Lab members",
    permission: "user:manage",
    purpose: "The people in this lab, their roles, invitations and locked accounts.",
  },
  {
    href: "/admin/settings",
    label: "Lab settings",
    permission: "user:manage",
    purpose: "Share links for outside reviewers, their default expiry, the upload limit and the password rules.",
  },
  {
    href: "/admin/api-keys",
    label: "Instrument keys",
    permission: "user:manage",
    purpose: "Keys for instrument PCs that push exports without a person signing in.",
  },
  {
    href: "/admin/audit",
    label: "Audit trail",
    permission: "audit:read",
    purpose: "Every sign-in, change, signature and export in this lab, in order, with who, when and why.",
  },
  {
    href: "/admin/validation",
    label: "Validation",
    permission: "validation:run",
    purpose: "The engine checked on this installation against the reference problems it ships with, with a signed report.",
  },
  {
    href: "/admin/inbox",
    label: "Demo inbox",
    permission: "user:manage",
    purpose: "The mail the local sink caught (demo and tests only).",
  },
];
