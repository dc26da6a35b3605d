import type { OpenSite } from '../../app/site.ts';
import type { KeyValueStore } from '../../app/blind/interpreterProfiles.ts';
import { DEFAULT_BUFFER_M, DEFAULT_MIN_COVER, RULE_KINDS, ruleProblem, type PixelRule } from '../../core/pixels/rule.ts';

// Which multispectral pixels count as pure, chosen once for an open site and followed
// by every view of pixels: the Training sheet, the pure pixels drawn on the desk's map,
// and the species spectra on the Rulings page. Kept on this machine per site (it is a
// way of looking, not a change to the site), so it is the same after a restart.

export class PixelRuleChoice {
  #kind = $state<PixelRule['kind']>('inside');
  #buffer = $state(DEFAULT_BUFFER_M);
  #minCover = $state(DEFAULT_MIN_COVER);

  constructor(private readonly storage: KeyValueStore | null, private readonly key: string) {
    const saved = readRule(storage?.getItem(key) ?? null);
    if (saved) this.#set(saved);
  }

  get kind(): PixelRule['kind'] { return this.#kind; }
  set kind(value: PixelRule['kind']) { this.#kind = value; this.#save(); }
  /** metres the patch is shrunk by, for the "wholly inside" rule */
  get buffer(): number { return this.#buffer; }
  set buffer(value: number) { this.#buffer = value; this.#save(); }
  /** least covered share, for the "covered at least" rule */
  get minCover(): number { return this.#minCover; }
  set minCover(value: number) { this.#minCover = value; this.#save(); }

  /** The rule as chosen (check `problem` before use). */
  get rule(): PixelRule {
    if (this.#kind === 'inside') return { kind: 'inside', buffer: Number(this.#buffer) };
    if (this.#kind === 'cover') return { kind: 'cover', minCover: Number(this.#minCover) };
    return { kind: 'centre' };
  }

  /** Why the chosen rule cannot be used (a number field left empty, say), or null. */
  get problem(): string | null {
    return ruleProblem(this.rule);
  }

  #set(rule: PixelRule): void {
    this.#kind = rule.kind;
    if (rule.kind === 'inside') this.#buffer = rule.buffer;
    if (rule.kind === 'cover') this.#minCover = rule.minCover;
  }

  #save(): void {
    if (!this.problem) this.storage?.setItem(this.key, JSON.stringify({ kind: this.#kind, buffer: this.#buffer, minCover: this.#minCover }));
  }
}

/** A stored rule, or null when the text is missing or not a usable rule. */
function readRule(text: string | null): PixelRule | null {
  if (!text) return null;
  try {
    const raw = JSON.parse(text) as { kind?: unknown; buffer?: unknown; minCover?: unknown };
    if (!RULE_KINDS.includes(raw.kind as PixelRule['kind'])) return null;
    const rule: PixelRule = raw.kind === 'inside' ? { kind: 'inside', buffer: Number(raw.buffer) }
      : raw.kind === 'cover' ? { kind: 'cover', minCover: Number(raw.minCover) } : { kind: 'centre' };
    return ruleProblem(rule) ? null : rule;
  } catch {
    return null;
  }
}

const choices = new WeakMap<OpenSite, PixelRuleChoice>();

/** The rule chosen for an open site: one object for all its pages. */
export function pixelRuleOf(site: OpenSite, storage: KeyValueStore | null = globalThis.localStorage ?? null): PixelRuleChoice {
  let choice = choices.get(site);
  if (!choice) {
    const id = site.store?.state.site?.id ?? site.name;
    choices.set(site, (choice = new PixelRuleChoice(storage, `fellfield.pixel-rule.${id}`)));
  }
  return choice;
}
