"use client";
// Asking why before points are excluded: one clicked, several box-selected, or one typed by number.
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Dialog } from "@/components/ui/dialog";
import { Input } from "@/components/ui/field";
import { formatNumber } from "@/lib/format/number";

export function ExclusionDialog(props: {
  pending: number[] | null;
  reason: string;
  onReason: (r: string) => void;
  onCancel: () => void;
  onConfirm: () => void;
  point: (i: number) => { t: number; y: number };
  tScale: number;
}) {
  const { pending, reason, tScale } = props;
  const one = pending?.length === 1 ? props.point(pending[0]!) : null;
  return (
    <Dialog open={pending !== null} onClose={props.onCancel} title={pending?.length === 1 ? `Exclude point ${pending[0]! + 1}` : `Exclude ${pending?.length ?? 0} selected points`}>
      <form
        onSubmit={(e) => {
          e.preventDefault();
          props.onConfirm();
        }}
        className="space-y-4"
      >
        <p className="text-sm">
          {one ? `t = ${formatNumber(one.t / tScale, 5)} ${tScale === 60 ? "min" : "s"}, y = ${formatNumber(one.y, 5)}. ` : ""}
          Each point stays in the record, greyed, with your reason.
        </p>
        <Input label="Reason (required)" value={reason} onChange={(e) => props.onReason(e.target.value)} autoFocus minLength={3} required />
        <div className="flex justify-end gap-2">
          <Button variant="secondary" onClick={props.onCancel}>
            Cancel
          </Button>
          <Button type="submit" disabled={reason.trim().length < 3}>
            Exclude
          </Button>
        </div>
      </form>
    </Dialog>
  );
}

/** The keyboard way to exclude a point: its number. */
export function ExcludeByNumber({ n, excluded, onPick }: { n: number; excluded: Set<number>; onPick: (i: number) => void }) {
  const [v, setV] = useState("");
  const i = Number(v) - 1;
  const ok = Number.isInteger(i) && i >= 0 && i < n && !excluded.has(i);
  return (
    <form
      className="mt-3 flex items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (ok) onPick(i);
      }}
    >
      <div className="flex-1">
        <Input label="Exclude point number" inputMode="numeric" value={v} onChange={(e) => setV(e.target.value)} hint={`1 to ${n}; keyboard alternative to clicking.`} />
      </div>
      <Button type="submit" variant="secondary" disabled={!ok}>
        Exclude…
      </Button>
    </form>
  );
}
