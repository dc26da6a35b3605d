// The raster window module's public surface.
export { readWindow, readWindowBands, DEFAULT_MAX_WINDOW_PIXELS, type PixelWindow, type ReadWindowOptions } from './readWindow.ts';
export { windowForExtent, extentOfWindow, levelPixelSize } from './pixelWindow.ts';
