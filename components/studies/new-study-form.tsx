"use client";
// Making a study: choose the fit versions whose rate constants go in, name it, save.
import { useRouter } from "next/navigation";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/field";
import { useToast } from "@/components/ui/toast";
import { formatWithUncertainty } from "@/lib/format/number";
import { problemText, sendJson } from "@/lib/http/client";

interface FitChoice {
  id: number;
  title: string;
  version: number;
  k: number | null;
  se: number | null;
  temperature_c: number | null;
  run_name: string;
}

export function NewStudyForm({ fits }: { fits: FitChoice[] }) {
  const router = useRouter();
  const toast = useToast();
  const [name, setName] = useState("");
  const [chosen, setChosen] = useState<number[]>([]);
  const [weighted, setWeighted] = useState(true);
  const [busy, setBusy] = useState(false);
  if (fits.length === 0) return <p className="text-sm text-ink-500">Save fits of runs first; a study groups their rate constants.</p>;

  async function submit() {
    setBusy(true);
    let body: { id: number };
    try {
      body = await sendJson<{ id: number }>("/api/studies", { body: { name, kind: "temperature", members: chosen.map((fitId) => ({ fitId })), options: { weighted, target_c: 25 } } });
    } catch (e) {
      return toast(problemText(e), "fault");
    } finally {
      setBusy(false);
    }
    router.push(`/studies/${body.id}`);
  }

  return (
    <div className="rounded-cell bg-paper-raised p-5 shadow-lift">
      <div className="mb-4 max-w-md">
        <Input label="Study name" value={name} onChange={(e) => setName(e.target.value)} />
      </div>
      <fieldset>
        <legend className="mb-2 text-sm font-semibold">Fits to include (one rate constant each)</legend>
        <ul className="grid gap-1 sm:grid-cols-2">
          {fits.map((f) => (
            <li key={f.id}>
              <label className="flex items-center gap-2 text-sm">
                <input type="checkbox" checked={chosen.includes(f.id)} onChange={(e) => setChosen(e.target.checked ? [...chosen, f.id] : chosen.filter((x) => x !== f.id))} />
                <span>
                  {f.title} <span className="text-ink-500">v{f.version} · {f.temperature_c ?? "?"} °C · k {formatWithUncertainty(f.k, f.se)} s⁻¹</span>
                </span>
              </label>
            </li>
          ))}
        </ul>
      </fieldset>
      <label className="mt-3 flex items-center gap-2 text-sm">
        <input type="checkbox" checked={weighted} onChange={(e) => setWeighted(e.target.checked)} />
        Weight each rate constant by (k / SE(k))²
      </label>
      <Button className="mt-4" onClick={submit} disabled={busy || !name.trim() || chosen.length < 2} data-testid="create-study">
        {busy ? "Saving…" : `Make the study (${chosen.length} fits)`}
      </Button>
    </div>
  );
}
