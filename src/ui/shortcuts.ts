// Every keyboard shortcut of the app, in one list: the help page shows it, and each
// surface handles its own keys. Add a row when you add a key.

export interface Shortcut {
  /** As the user types it, e.g. 'P', 'Ctrl+Z', '1-9'. */
  keys: string;
  action: string;
  /** Where the key works. */
  where: 'everywhere' | 'desk' | 'sheets' | 'rulings' | 'export' | 'help';
}

export const shortcuts: Shortcut[] = [
  { keys: 'P', action: 'show the panchromatic image', where: 'desk' },
  { keys: 'N', action: 'show the natural-colour composite', where: 'desk' },
  { keys: 'D', action: 'show the next date of the scene', where: 'desk' },
  { keys: 'F', action: 'show or hide the field polygons', where: 'desk' },
  { keys: '?', action: 'open this page of keys and cautions', where: 'everywhere' },
  { keys: 'Esc', action: 'back to the desk from another page', where: 'everywhere' },
];
