/** True while the user types in a field or uses a modifier: single-key shortcuts stay out of the way. */
export function isTyping(event: KeyboardEvent): boolean {
  const target = event.target as HTMLElement | null;
  return Boolean(target?.closest?.('input, textarea, select, [contenteditable]')) || event.ctrlKey || event.metaKey || event.altKey;
}
