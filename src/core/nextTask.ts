// Yielding to the event loop between slices of long work. A chain of setTimeout(0)
// waits at least 4 ms a step once timers nest five deep (HTML Living Standard, timer
// initialization steps: "If nesting level is greater than 5, and timeout is less than
// 4, then set timeout to 4"), which a loop of a hundred slices pays in full. A message
// through a MessageChannel is a task of its own with no such floor, so input and other
// messages still get their turn between slices.

/** Resolves in a later task of the event loop. */
export function nextTask(): Promise<void> {
  return new Promise((resolve) => {
    const { port1, port2 } = new MessageChannel();
    port1.onmessage = () => {
      port1.close();
      resolve();
    };
    port2.postMessage(null);
  });
}
