// The meaning of an acknowledgement signature (21 CFR Part 11 §11.50(a)(3) as the model):
// shown before signing and stored with the record, word for word.
export function acknowledgementMeaning({ versionLabel, studyCode }: { versionLabel: string; studyCode: string }): string {
  return `I have read protocol version ${versionLabel} of study ${studyCode} and will conduct the study in accordance with it.`;
}
