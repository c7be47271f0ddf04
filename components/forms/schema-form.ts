"use client";
// Forms on the route's own schema: react-hook-form holds the values as typed, and zodResolver checks them by turning
// them into the request body and parsing that with the schema the route parses. The form's fields carry the body's
// paths, so each issue lands on its field; what the server still refuses (a rule only it can check) is set on the
// form's root and listed with the rest.
import { zodResolver } from "@hookform/resolvers/zod";
import { get, useForm, type DefaultValues, type FieldErrors, type FieldValues, type Resolver, type UseFormProps } from "react-hook-form";
import { z } from "zod";
import { problemLines } from "@/lib/http/client";

/** The form's schema: its values → the request body → the route's schema. */
export function bodySchema<V extends FieldValues, S extends z.ZodType>(toBody: (v: V) => unknown, schema: S) {
  return z.custom<V>(() => true).pipe(z.preprocess((v) => toBody(v as V), schema));
}

/** useForm with the route's schema as its resolver; `onSubmit` gets the parsed body. */
export function useSchemaForm<V extends FieldValues, S extends z.ZodType>(toBody: (v: V) => unknown, schema: S, defaultValues: DefaultValues<V>, opts: Omit<UseFormProps<V, unknown, z.output<S>>, "resolver" | "defaultValues"> = {}) {
  const resolver: Resolver<V, unknown, z.output<S>> = zodResolver(bodySchema(toBody, schema));
  return useForm<V, unknown, z.output<S>>({ ...opts, defaultValues, resolver });
}

/** A field's message, by path. */
export function fieldError(errors: FieldErrors, path: string): string | undefined {
  return (get(errors, path) as { message?: string } | undefined)?.message;
}

/** Every message in a form's errors, "field: message" (the server's own refusal as it said it), in the form's order. */
export function formMessages(errors: FieldErrors, prefix = "", strip: RegExp = /^$/): string[] {
  const out: string[] = [];
  for (const [k, v] of Object.entries(errors)) {
    if (!v || typeof v !== "object") continue;
    const path = prefix ? `${prefix}.${k}` : k;
    const message = (v as { message?: unknown }).message;
    if (typeof message === "string" && message) out.push(path === "root.server" ? message : `${path.replace(strip, "")}: ${message}`);
    else out.push(...formMessages(v as FieldErrors, path, strip));
  }
  return out;
}

/** The server's refusal as the form's root error, each field issue on its own line. */
export function serverProblem(e: unknown, strip: RegExp = /^$/): { message: string } {
  return { message: problemLines(e, strip).join(" · ") };
}
