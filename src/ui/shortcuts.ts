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
  { keys: 'C', action: 'show the colour-infrared composite', where: 'desk' },
  { keys: 'S', action: 'show the pan-sharpened composite', where: 'desk' },
  { keys: 'V', action: 'show the vegetation index', where: 'desk' },
  { keys: 'M', action: 'show only vegetation (index threshold) or all pixels', where: 'desk' },
  { keys: 'E', action: 'fit the stretch to the pixels on screen', where: 'desk' },
  { keys: 'W', action: 'swipe the other date across this one, or stop', where: 'desk' },
  { keys: 'B', action: 'flicker between the two dates, or stop', where: 'desk' },
  { keys: 'F', action: 'show or hide the field polygons', where: 'desk' },
  { keys: '?', action: 'open this page of keys and cautions', where: 'everywhere' },
  { keys: 'Esc', action: 'back to the desk from another page', where: 'everywhere' },
];
