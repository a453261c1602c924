"use client";

// A labelled filter drop-down whose first choice ("All …") clears the filter.
export type FilterOption = string | readonly [value: string, label: string];

export function FilterSelect({
  label,
  value,
  onChange,
  allLabel,
  options,
  testId,
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  allLabel: string;
  options: readonly FilterOption[];
  testId?: string;
}) {
  return (
    <label className="field">
      <span>{label}</span>
      {/* aria-label: a wrapping label would also read out the chosen option. */}
      <select className="input" value={value} onChange={(e) => onChange(e.target.value)} data-testid={testId} aria-label={label}>
        <option value="">{allLabel}</option>
        {options.map((o) => {
          const [v, text] = typeof o === "string" ? [o, o] : o;
          return (
            <option key={v} value={v}>
              {text}
            </option>
          );
        })}
      </select>
    </label>
  );
}
