import { redirect } from "next/navigation";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";
import { can } from "@/lib/permissions";

// The front door: each role lands on the first area it may use.
export default async function Home() {
  const user = await requirePageUser(undefined, "/");
  const first = AREAS.find((a) => can(user, a.permission));
  redirect(first?.href ?? "/sign-in");
}
