import type { ReportLine } from '../../core/blind/index.ts';

// Draws the report lines on a canvas and returns it as PNG bytes: a sheet that can be
// attached to a field report or a methods appendix as it was seen.

const STYLE: Record<ReportLine['kind'], { font: string; colour: string; gap: number }> = {
  title: { font: '600 22px system-ui, sans-serif', colour: '#111111', gap: 34 },
  heading: { font: '600 16px system-ui, sans-serif', colour: '#1d3f5e', gap: 30 },
  figure: { font: '14px system-ui, sans-serif', colour: '#111111', gap: 20 },
  explanation: { font: '13px system-ui, sans-serif', colour: '#444444', gap: 19 },
  table: { font: '13px ui-monospace, monospace', colour: '#111111', gap: 18 },
};

const WIDTH = 1100;
const MARGIN = 36;

function wrap(ctx: CanvasRenderingContext2D, text: string, width: number): string[] {
  const words = text.split(' ');
  const out: string[] = [];
  let line = '';
  for (const word of words) {
    const next = line ? `${line} ${word}` : word;
    if (ctx.measureText(next).width > width && line) {
      out.push(line);
      line = word;
    } else line = next;
  }
  if (line) out.push(line);
  return out;
}

/** The report drawn on a white page; returns the canvas (for PNG or JPEG). */
export function drawReport(lines: readonly ReportLine[]): HTMLCanvasElement {
  const canvas = document.createElement('canvas');
  const measure = canvas.getContext('2d')!;
  const laid: { text: string; kind: ReportLine['kind']; y: number }[] = [];
  let y = MARGIN;
  for (const line of lines) {
    measure.font = STYLE[line.kind].font;
    const parts = line.kind === 'table' ? [line.text] : wrap(measure, line.text, WIDTH - 2 * MARGIN);
    if (line.kind === 'heading') y += 8;
    for (const text of parts) {
      y += STYLE[line.kind].gap;
      laid.push({ text, kind: line.kind, y });
    }
  }
  canvas.width = WIDTH;
  canvas.height = y + MARGIN;
  const ctx = canvas.getContext('2d')!;
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, canvas.width, canvas.height);
  for (const { text, kind, y: at } of laid) {
    ctx.font = STYLE[kind].font;
    ctx.fillStyle = STYLE[kind].colour;
    ctx.fillText(text, MARGIN, at);
  }
  return canvas;
}

export async function canvasBytes(canvas: HTMLCanvasElement, type: 'image/png' | 'image/jpeg'): Promise<Uint8Array> {
  const blob = await new Promise<Blob | null>((resolve) => canvas.toBlob(resolve, type, 0.92));
  if (!blob) throw new Error('the report could not be drawn as an image');
  return new Uint8Array(await blob.arrayBuffer());
}
