import { CircleAlert, CircleCheck, CircleDashed, CircleDot, CircleX, Info, type LucideIcon } from "lucide-react";

// Status is never colour alone: every chip has a word and an icon.
export type Tone = "ok" | "attention" | "danger" | "info" | "neutral" | "progress";

const tones: Record<Tone, { cls: string; Icon: LucideIcon }> = {
  ok: { cls: "border-lichen bg-lichen-light text-lichen-dark", Icon: CircleCheck },
  attention: { cls: "border-ochre bg-ochre-light text-ochre-dark", Icon: CircleAlert },
  danger: { cls: "border-brick bg-brick-light text-brick-dark", Icon: CircleX },
  info: { cls: "border-slate bg-slate-light text-slate-dark", Icon: Info },
  neutral: { cls: "border-rule bg-paper text-ink", Icon: CircleDashed },
  progress: { cls: "border-slate bg-white text-slate-dark", Icon: CircleDot },
};

export function StatusChip({ tone, children, icon }: { tone: Tone; children: React.ReactNode; icon?: LucideIcon }) {
  const { cls, Icon } = tones[tone];
  const Shown = icon ?? Icon;
  return (
    <span className={`inline-flex items-center gap-1 whitespace-nowrap rounded-full border px-2 py-0.5 text-xs font-semibold ${cls}`}>
      <Shown aria-hidden size={12} />
      {children}
    </span>
  );
}
