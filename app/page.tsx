import { redirect } from "next/navigation";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";
import { can } from "@/lib/permissions";

// The front door: a reviewer lands on the review desk (the queue, with its count in the navigation); every other role
// on the first area it may use.
export default async function Home() {
  const user = await requirePageUser(undefined, "/");
  if (can(user, "review:decide")) redirect("/reviews");
  const first = AREAS.find((a) => can(user, a.permission));
  redirect(first?.href ?? "/sign-in");
}
