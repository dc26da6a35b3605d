// The desk's patch keys (listed for users in src/ui/shortcuts.ts). They keep clear of the
// imagery keys (P N C S V M D W B E), the field toggle (F), the findings (X) and help (?), and a roster
// entry may not take any of them.

export const CONFIDENCE_KEYS = { h: 'sure', j: 'likely', k: 'unsure' } as const;

export const TOOL_KEYS = {
  a: 'draw',
  q: 'freehand',
  o: 'edit',
  r: 'move',
  l: 'split',
  y: 'merge',
} as const;

export type Tool = 'select' | (typeof TOOL_KEYS)[keyof typeof TOOL_KEYS];

export const ACTION_KEYS = { u: 'next untagged', i: 'next unsure', t: 'note', g: 'jump' } as const;

/** Single keys the desk uses for something else, so a roster entry cannot take them. */
export const DESK_KEYS: ReadonlySet<string> = new Set([
  'p', 'n', 'c', 's', 'v', 'm', 'd', 'w', 'b', 'e', 'f', 'x', '?',
  // Z: "can't tell" in a blind pass (BlindPassPanel)
  'z',
  ...Object.keys(CONFIDENCE_KEYS), ...Object.keys(TOOL_KEYS), ...Object.keys(ACTION_KEYS),
]);
