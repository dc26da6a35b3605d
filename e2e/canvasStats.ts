import type { Page } from 'playwright-core';

export interface CanvasStats {
  /** Share of the map's pixels with any opacity. */
  opaqueShare: number;
  lumaStdDev: number;
  meanRed: number;
  meanGreen: number;
  /** Mean of max(r,g,b) - min(r,g,b) over opaque pixels: 0 for grey. */
  meanSaturation: number;
  /** Hue buckets (30 degrees each) holding at least 0.5 % of the saturated pixels. */
  distinctHues: number;
}

/** Pixel statistics of the map's layer canvases matched by a selector, read in the page. */
export function layerCanvasStats(page: Page, selector: string): Promise<CanvasStats> {
  return page.evaluate((sel) => {
    const canvases = [...document.querySelectorAll<HTMLCanvasElement>(sel)].filter((c) => c.width > 0 && c.height > 0);
    let total = 0, opaque = 0, sum = 0, sumSq = 0, red = 0, green = 0, sat = 0, saturated = 0;
    const hues = new Array(12).fill(0);
    for (const canvas of canvases) {
      const data = canvas.getContext('2d')!.getImageData(0, 0, canvas.width, canvas.height).data;
      total += canvas.width * canvas.height;
      for (let i = 0; i < data.length; i += 4) {
        if (data[i + 3] === 0) continue;
        const r = data[i], g = data[i + 1], b = data[i + 2];
        const luma = 0.299 * r + 0.587 * g + 0.114 * b;
        opaque++;
        sum += luma;
        sumSq += luma * luma;
        red += r;
        green += g;
        const max = Math.max(r, g, b), min = Math.min(r, g, b);
        sat += max - min;
        if (max - min > 60) {
          saturated++;
          let h = max === r ? (g - b) / (max - min) : max === g ? 2 + (b - r) / (max - min) : 4 + (r - g) / (max - min);
          h = ((h * 60) + 360) % 360;
          hues[Math.floor(h / 30)]++;
        }
      }
    }
    const mean = opaque ? sum / opaque : 0;
    return {
      opaqueShare: total ? opaque / total : 0,
      lumaStdDev: opaque ? Math.sqrt(Math.max(0, sumSq / opaque - mean * mean)) : 0,
      meanRed: opaque ? red / opaque : 0,
      meanGreen: opaque ? green / opaque : 0,
      meanSaturation: opaque ? sat / opaque : 0,
      distinctHues: hues.filter((n) => saturated && n / saturated >= 0.005).length,
    };
  }, selector);
}
