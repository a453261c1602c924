// Protocol version labels "major.minor" and amendment numbers (common practice: the first
// approved protocol is 1.0; a substantial amendment starts the next major version, 2.0; a
// non-substantial one the next minor version, 2.1; amendments are numbered 1, 2, 3… in order
// of release whatever their kind). Client-safe.
import { z } from "zod";

export interface VersionLabel {
  major: number;
  minor: number;
}

export const firstVersionLabel = "1.0";

export const versionLabelSchema = z
  .string()
  .trim()
  .regex(/^(0|[1-9]\d{0,3})\.(0|[1-9]\d{0,3})$/, "A version label looks like 1.0 or 2.1");

export function parseVersionLabel(label: string): VersionLabel {
  const m = /^(0|[1-9]\d{0,3})\.(0|[1-9]\d{0,3})$/.exec(label.trim());
  if (!m) throw new Error(`"${label}" is not a version label (expected major.minor, e.g. 2.1)`);
  return { major: Number(m[1]), minor: Number(m[2]) };
}

export function formatVersionLabel({ major, minor }: VersionLabel): string {
  return `${major}.${minor}`;
}

/** Label of the version that amends `parent` (null parent: the first version, 1.0). */
export function nextVersionLabel(parent: string | null, substantial: boolean): string {
  if (parent === null) return firstVersionLabel;
  const { major, minor } = parseVersionLabel(parent);
  return substantial ? formatVersionLabel({ major: major + 1, minor: 0 }) : formatVersionLabel({ major, minor: minor + 1 });
}

/** Numeric order of labels (1.10 comes after 1.9). */
export function compareVersionLabels(a: string, b: string): number {
  const x = parseVersionLabel(a);
  const y = parseVersionLabel(b);
  return x.major - y.major || x.minor - y.minor;
}

/**
 * Amendment number of a new version: amendments already made to the protocol + 1.
 * The first version (no parent) is not an amendment and has none.
 */
export function nextAmendmentNumber(parent: string | null, amendmentsSoFar: number): number | null {
  if (parent === null) return null;
  if (!Number.isInteger(amendmentsSoFar) || amendmentsSoFar < 0) throw new Error("The count of earlier amendments must be a whole number ≥ 0");
  return amendmentsSoFar + 1;
}

export function amendmentLabel(amendmentNumber: number | null, substantial: boolean): string {
  if (amendmentNumber === null) return "Original protocol";
  return `Amendment ${amendmentNumber} (${substantial ? "substantial" : "non-substantial"})`;
}
