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
  { keys: 'W', action: 'swipe the other date across this one, or stop (drag the line on the map to move it)', where: 'desk' },
  { keys: 'B', action: 'flicker between the two dates, or stop', where: 'desk' },
  { keys: 'F', action: 'show or hide the field polygons', where: 'desk' },
  { keys: '=', action: 'zoom to full resolution: one pixel of the sharpest image per screen pixel', where: 'desk' },
  { keys: '← → ↑ ↓', action: 'move the view a quarter of the screen', where: 'desk' },
  { keys: 'Shift+← → ↑ ↓', action: 'move the view a whole screen (a tenth stays in sight), to go over a scene screen by screen; the screens around are read ahead', where: 'desk' },
  { keys: 'Shift+P', action: 'show or hide the pure pixels (of the patch in hand; of every patch in view when close)', where: 'desk' },
  { keys: '1-7', action: 'tag the patch in hand with the roster entry of that key (each entry has its own key)', where: 'desk' },
  { keys: 'H', action: 'confidence of your call: sure', where: 'desk' },
  { keys: 'J', action: 'confidence of your call: likely', where: 'desk' },
  { keys: 'K', action: 'confidence of your call: unsure', where: 'desk' },
  { keys: 'T', action: 'write a note on your call (Enter keeps it)', where: 'desk' },
  { keys: 'U', action: 'go to the next patch without a call of yours', where: 'desk' },
  { keys: 'I', action: 'go to the next patch tagged unsure', where: 'desk' },
  { keys: 'G', action: 'go to a patch by its id', where: 'desk' },
  { keys: 'Shift+G', action: 'with a patch sent from the Rulings page: back to the same place in the queue', where: 'desk' },
  { keys: 'A', action: 'draw a patch corner by corner', where: 'desk' },
  { keys: 'Q', action: 'trace a patch freehand', where: 'desk' },
  { keys: 'O', action: 'reshape the patch in hand (Alt+click removes a corner)', where: 'desk' },
  { keys: 'R', action: 'move the patch in hand', where: 'desk' },
  { keys: 'L', action: 'cut the patch in hand with a line', where: 'desk' },
  { keys: 'Y', action: 'join a neighbour into the patch in hand', where: 'desk' },
  { keys: 'Del', action: 'delete the patch in hand', where: 'desk' },
  { keys: 'Esc', action: 'put the tool down, then let go of the patch', where: 'desk' },
  { keys: 'Ctrl+Z', action: 'undo the last change (many steps)', where: 'desk' },
  { keys: 'Ctrl+Shift+Z, Ctrl+Y', action: 'redo', where: 'desk' },
  { keys: 'X', action: 'go to the next finding', where: 'desk' },
  { keys: 'Z', action: "in a blind pass: call the patch in hand “can't tell”", where: 'desk' },
  { keys: 'Shift+X', action: 'go to the previous finding', where: 'desk' },
  { keys: '↓ or .', action: 'go to the next disagreement', where: 'rulings' },
  { keys: '↑ or ,', action: 'go to the previous disagreement', where: 'rulings' },
  { keys: 'Shift+A', action: "accept the first interpreter's call (A)", where: 'rulings' },
  { keys: 'Shift+B', action: "accept the second interpreter's call (B)", where: 'rulings' },
  { keys: '1-7', action: 'rule the species of that roster key (a reason is asked when it overrules every call)', where: 'rulings' },
  { keys: 'Shift+M', action: 'rule the patch mixed', where: 'rulings' },
  { keys: 'Shift+E', action: 'leave the patch out of training', where: 'rulings' },
  { keys: 'R', action: 'write the reason (Enter records a ruling waiting for it)', where: 'rulings' },
  { keys: 'Shift+R', action: 'reopen the ruling in force, with the reason written', where: 'rulings' },
  { keys: 'Shift+T', action: 'send the patch to a third reader (a blind pass of that patch)', where: 'rulings' },
  { keys: 'G', action: 'take the patch in hand to the desk to cut or reshape it first', where: 'rulings' },
  { keys: 'P N C S V D', action: 'imagery of the patch in hand: pan, natural, infrared, pan-sharpened, index, other date', where: 'rulings' },
  { keys: 'Ctrl+Z', action: 'on the Training sheet: undo the last change of the site (a scheme edit, or one made on the desk)', where: 'sheets' },
  { keys: 'Ctrl+Shift+Z, Ctrl+Y', action: 'on the Training sheet: redo', where: 'sheets' },
  { keys: 'Ctrl+S', action: 'save the whole site (not the imagery) as one backup file', where: 'everywhere' },
  { keys: '?', action: 'open this page of keys and cautions', where: 'everywhere' },
  { keys: 'Esc', action: 'back to the desk from another page', where: 'everywhere' },
];
