// The pages of an open site, in the order the bar shows them. A page is listed only
// once it works; add yours here and render it in App.svelte.

export type Surface = 'desk' | 'agreement' | 'rulings' | 'sheets' | 'export' | 'help';

export interface SurfaceEntry {
  id: Surface;
  label: string;
}

export const surfaces: SurfaceEntry[] = [
  { id: 'desk', label: 'Desk' },
  { id: 'agreement', label: 'Agreement sheet' },
  { id: 'rulings', label: 'Rulings' },
  { id: 'sheets', label: 'Training sheet' },
  { id: 'export', label: 'Export' },
  { id: 'help', label: 'Keys and cautions' },
];
