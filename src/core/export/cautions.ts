// The cautions every export carries (DESIGN.md, "Safety and cautions").
export const EXPORT_CAUTIONS: readonly string[] = [
  'Labels are interpretations of imagery, not observations on the ground.',
  'Verify in the field before any management decision (felling, pruning, treatment).',
  'Follow local regulations and agency protocols.',
  'Field checks at treeline carry weather risk: plan for afternoon storms and exposure.',
];
