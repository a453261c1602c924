"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { ApiError, apiFetch } from "@/lib/api/client";
import { budgetVersionInputSchema, cycleLabels, milestoneLabels, triggerLabels } from "@/lib/budgets/budget-input";

export type BudgetFormDefaults = {
  startupFee: string;
  screenFailureFee: string;
  milestones: { kind: string; n: string; amount: string }[];
  visitFees: { visitCode: string; amount: string }[];
  screenFailureCapPerEnrolled: string;
  screenFailureCapMax: string;
  overheadPercent: string;
  holdbackPercent: string;
  cycle: string;
  netDays: string;
  trigger: string;
};

type Errors = Record<string, string[]>;

function FieldError({ errors, name }: { errors: Errors; name: string }) {
  const e = errors[name];
  return e ? (
    <span role="alert" className="text-xs text-brick">
      {e[0]}
    </span>
  ) : null;
}

/** A new budget version: validated here with the same schema the server uses, then posted. */
export function BudgetForm({
  siteId,
  currency,
  defaults,
  protocolVersions,
  nextVersion,
}: {
  siteId: string;
  currency: string;
  defaults: BudgetFormDefaults;
  protocolVersions: { id: string; label: string; approvedOn: string }[];
  nextVersion: number;
}) {
  const router = useRouter();
  const [v, setV] = useState({ ...defaults, effectiveFrom: "", protocolVersionId: "", reason: "" });
  const [errors, setErrors] = useState<Errors>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const set = (k: keyof typeof v) => (e: React.ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setV({ ...v, [k]: e.target.value });

  const body = () => ({
    effectiveFrom: v.protocolVersionId ? null : v.effectiveFrom || null,
    protocolVersionId: v.protocolVersionId || null,
    reason: v.reason,
    startupFee: v.startupFee,
    milestones: v.milestones.map((m) => ({ kind: m.kind, n: m.kind === "nth_enrolled" ? m.n : null, amount: m.amount })),
    visitFees: v.visitFees.filter((f) => f.visitCode || f.amount).map((f) => ({ visitCode: f.visitCode, amount: f.amount })),
    screenFailureFee: v.screenFailureFee,
    screenFailureCapPerEnrolled: v.screenFailureCapPerEnrolled || null,
    screenFailureCapMax: v.screenFailureCapMax || null,
    overheadPercent: v.overheadPercent,
    holdbackPercent: v.holdbackPercent,
    cycle: v.cycle,
    netDays: v.netDays,
    trigger: v.trigger,
  });

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setMessage(null);
    const parsed = budgetVersionInputSchema(currency).safeParse(body());
    if (!parsed.success) {
      const fields: Errors = {};
      for (const i of parsed.error.issues) (fields[i.path.join(".")] ??= []).push(i.message);
      setErrors(fields);
      setMessage("Check the highlighted fields.");
      return;
    }
    setErrors({});
    setBusy(true);
    try {
      await apiFetch(`/api/v1/sites/${siteId}/budget`, { method: "POST", json: body() });
      setMessage(`Version ${nextVersion} saved.`);
      router.refresh();
    } catch (err) {
      if (err instanceof ApiError) {
        setErrors(err.fields ?? {});
        setMessage(err.message);
      } else setMessage("Could not save the budget.");
    } finally {
      setBusy(false);
    }
  }

  const money = (name: string, label: string, value: string, onChange: (e: React.ChangeEvent<HTMLInputElement>) => void) => (
    <label className="field">
      <span>
        {label} ({currency})
      </span>
      <input className="input amount" inputMode="decimal" value={value} onChange={onChange} aria-invalid={Boolean(errors[name])} />
      <FieldError errors={errors} name={name} />
    </label>
  );

  return (
    <form onSubmit={submit} className="space-y-4" noValidate aria-label="Budget version">
      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="font-semibold">Version {nextVersion}</legend>
        <label className="field">
          <span>Follows protocol version (optional)</span>
          <select className="input" value={v.protocolVersionId} onChange={set("protocolVersionId")}>
            <option value="">— none —</option>
            {protocolVersions.map((p) => (
              <option key={p.id} value={p.id}>
                {p.label} (approved here {p.approvedOn})
              </option>
            ))}
          </select>
          <FieldError errors={errors} name="protocolVersionId" />
        </label>
        <label className="field">
          <span>Effective from</span>
          <input className="input" type="date" value={v.protocolVersionId ? (protocolVersions.find((p) => p.id === v.protocolVersionId)?.approvedOn ?? "") : v.effectiveFrom} disabled={Boolean(v.protocolVersionId)} onChange={set("effectiveFrom")} />
          <FieldError errors={errors} name="effectiveFrom" />
        </label>
        <label className="field">
          <span>Reason</span>
          <input className="input" value={v.reason} onChange={set("reason")} />
          <FieldError errors={errors} name="reason" />
        </label>
      </fieldset>

      <fieldset className="grid gap-3 sm:grid-cols-3">
        <legend className="font-semibold">Fees</legend>
        {money("startupFee", "Start-up fee", v.startupFee, set("startupFee"))}
        {money("screenFailureFee", "Screen-failure fee", v.screenFailureFee, set("screenFailureFee"))}
        <div className="grid grid-cols-2 gap-2">
          <label className="field">
            <span>One paid per N enrolled</span>
            <input className="input" inputMode="numeric" value={v.screenFailureCapPerEnrolled} onChange={set("screenFailureCapPerEnrolled")} />
            <FieldError errors={errors} name="screenFailureCapPerEnrolled" />
          </label>
          <label className="field">
            <span>At most (in all)</span>
            <input className="input" inputMode="numeric" value={v.screenFailureCapMax} onChange={set("screenFailureCapMax")} />
            <FieldError errors={errors} name="screenFailureCapMax" />
          </label>
        </div>
      </fieldset>

      <fieldset className="space-y-2">
        <legend className="font-semibold">Milestones</legend>
        {v.milestones.map((m, i) => (
          <div key={i} className="flex flex-wrap items-end gap-2">
            <label className="field">
              <span>Milestone</span>
              <select className="input" value={m.kind} onChange={(e) => setV({ ...v, milestones: v.milestones.map((x, j) => (j === i ? { ...x, kind: e.target.value } : x)) })}>
                {Object.entries(milestoneLabels).map(([k, label]) => (
                  <option key={k} value={k}>
                    {label}
                  </option>
                ))}
              </select>
              <FieldError errors={errors} name={`milestones.${i}.kind`} />
            </label>
            {m.kind === "nth_enrolled" ? (
              <label className="field w-20">
                <span>N</span>
                <input className="input" inputMode="numeric" value={m.n} onChange={(e) => setV({ ...v, milestones: v.milestones.map((x, j) => (j === i ? { ...x, n: e.target.value } : x)) })} />
                <FieldError errors={errors} name={`milestones.${i}.n`} />
              </label>
            ) : null}
            {money(`milestones.${i}.amount`, "Amount", m.amount, (e) => setV({ ...v, milestones: v.milestones.map((x, j) => (j === i ? { ...x, amount: e.target.value } : x)) }))}
            <button type="button" className="btn-secondary" onClick={() => setV({ ...v, milestones: v.milestones.filter((_, j) => j !== i) })}>
              Remove
            </button>
          </div>
        ))}
        <button type="button" className="btn-secondary" onClick={() => setV({ ...v, milestones: [...v.milestones, { kind: "first_implant", n: "", amount: "" }] })}>
          Add a milestone
        </button>
      </fieldset>

      <fieldset className="space-y-2">
        <legend className="font-semibold">Fee per visit code</legend>
        {v.visitFees.map((f, i) => (
          <div key={i} className="flex flex-wrap items-end gap-2">
            <label className="field w-32">
              <span>Visit code</span>
              <input className="input font-mono" value={f.visitCode} onChange={(e) => setV({ ...v, visitFees: v.visitFees.map((x, j) => (j === i ? { ...x, visitCode: e.target.value.toUpperCase() } : x)) })} />
              <FieldError errors={errors} name={`visitFees.${i}.visitCode`} />
            </label>
            {money(`visitFees.${i}.amount`, "Fee", f.amount, (e) => setV({ ...v, visitFees: v.visitFees.map((x, j) => (j === i ? { ...x, amount: e.target.value } : x)) }))}
            <button type="button" className="btn-secondary" onClick={() => setV({ ...v, visitFees: v.visitFees.filter((_, j) => j !== i) })}>
              Remove
            </button>
          </div>
        ))}
        <button type="button" className="btn-secondary" onClick={() => setV({ ...v, visitFees: [...v.visitFees, { visitCode: "", amount: "" }] })}>
          Add a visit fee
        </button>
      </fieldset>

      <fieldset className="grid gap-3 sm:grid-cols-5">
        <legend className="font-semibold">Rates and terms</legend>
        <label className="field">
          <span>Overhead (%)</span>
          <input className="input amount" inputMode="decimal" value={v.overheadPercent} onChange={set("overheadPercent")} />
          <FieldError errors={errors} name="overheadPercent" />
        </label>
        <label className="field">
          <span>Holdback (%)</span>
          <input className="input amount" inputMode="decimal" value={v.holdbackPercent} onChange={set("holdbackPercent")} />
          <FieldError errors={errors} name="holdbackPercent" />
        </label>
        <label className="field">
          <span>Payment cycle</span>
          <select className="input" value={v.cycle} onChange={set("cycle")}>
            {Object.entries(cycleLabels).map(([k, label]) => (
              <option key={k} value={k}>
                {label}
              </option>
            ))}
          </select>
        </label>
        <label className="field">
          <span>Payment terms (net days)</span>
          <input className="input amount" inputMode="numeric" value={v.netDays} onChange={set("netDays")} />
          <FieldError errors={errors} name="netDays" />
        </label>
        <label className="field">
          <span>Visit fee earned on</span>
          <select className="input" value={v.trigger} onChange={set("trigger")}>
            {Object.entries(triggerLabels).map(([k, label]) => (
              <option key={k} value={k}>
                {label}
              </option>
            ))}
          </select>
        </label>
      </fieldset>

      <div className="flex items-center gap-3">
        <button type="submit" className="btn" disabled={busy}>
          {busy ? "Saving…" : `Save version ${nextVersion}`}
        </button>
        {message ? (
          <span role="status" className="text-sm">
            {message}
          </span>
        ) : null}
      </div>
    </form>
  );
}
