import { z } from "zod";

/** Route ids: positive integers written in the path. */
export const idParam = z.coerce.number().int().positive();
