import PointerInteraction from 'ol/interaction/Pointer.js';
import type MapBrowserEvent from 'ol/MapBrowserEvent.js';

/** How near the swipe line (CSS pixels) a press takes hold of it. */
const GRAB_PX = 8;

export interface SwipeDragOptions {
  /** Where the line is now (0-1 of the map's width), or null when no swipe is shown. */
  position: () => number | null;
  /** The line moved to `position` (0-1 of the map's width). */
  onMove: (position: number) => void;
}

/**
 * Dragging the swipe line between two dates across the map. A press near the line takes
 * it (and not the map, which stays put); elsewhere the map pans as usual. Near the line
 * the cursor says it can be moved.
 */
export function swipeDrag(options: SwipeDragOptions): PointerInteraction {
  const near = (event: MapBrowserEvent) => {
    const position = options.position();
    const width = event.map.getSize()?.[0] ?? 0;
    return position !== null && width > 0 && Math.abs(event.pixel[0] - position * width) <= GRAB_PX;
  };
  const moveTo = (event: MapBrowserEvent) => {
    const width = event.map.getSize()?.[0] ?? 0;
    if (width > 0) options.onMove(Math.min(1, Math.max(0, event.pixel[0] / width)));
  };
  let dragging = false;
  return new PointerInteraction({
    handleDownEvent: (event) => {
      dragging = near(event);
      return dragging; // true keeps the drag here, away from panning
    },
    handleDragEvent: (event) => {
      if (dragging) moveTo(event);
    },
    handleUpEvent: () => {
      dragging = false;
      return false;
    },
    handleMoveEvent: (event) => {
      const target = event.map.getTargetElement();
      if (!target) return;
      const grab = dragging || near(event);
      if (grab) target.style.cursor = 'ew-resize';
      else if (target.style.cursor === 'ew-resize') target.style.cursor = '';
    },
  });
}
