import type { ReactNode } from "react";
import { requirePageUser } from "@/lib/auth/page";

// The list's guard runs here, above loading.tsx's Suspense boundary: a signed-out visitor is redirected and a user
// without the permission gets a real 403 before the skeleton streams (the page checks again for its own use).
export default async function Guard({ children }: { children: ReactNode }) {
  await requirePageUser("review:read", "/reviews");
  return children;
}
