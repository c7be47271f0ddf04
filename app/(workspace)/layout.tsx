import type { ReactNode } from "react";
import { SideRail } from "@/components/shell/side-rail";
import { getDb } from "@/db";
import { requirePageUser } from "@/lib/auth/page";
import { AREAS } from "@/lib/navigation";
import { can, ROLE_LABELS } from "@/lib/permissions";
import { waitingForMe } from "@/lib/reviews";

// The signed-in shell: the lab's areas on a rail (only those the role may use), the page on the right.
export default async function WorkspaceLayout({ children }: { children: ReactNode }) {
  const user = await requirePageUser();
  // The review desk's count: records waiting for this reviewer's decision.
  const waiting = can(user, "review:decide") ? await waitingForMe(await getDb(), user) : 0;
  const areas = AREAS.filter((a) => can(user, a.permission)).map(({ href, label }) => ({ href, label, count: href === "/reviews" && waiting > 0 ? waiting : undefined }));
  return (
    <div className="flex min-h-screen flex-col md:flex-row">
      <SideRail
        areas={areas}
        lab={user.labName}
        person={{ name: user.name, role: ROLE_LABELS[user.role], email: user.email }}
      />
      <main id="main" className="min-w-0 flex-1 px-gutter py-8 lg:px-10">
        {children}
      </main>
    </div>
  );
}
