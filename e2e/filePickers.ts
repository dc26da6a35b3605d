// Init scripts for the page's file picker of the File System Access API
// (showOpenFilePicker, WICG File System Access), through which a browser that has it picks
// a site's imagery. Its dialog is native: no test can answer it, and Playwright's file
// chooser does not catch it (it refuses the call while it listens for file choosers).
// Each script runs in the page before the app and must stand alone.

/**
 * The picker asks through a file input, which the test answers with files on disk as
 * usual; each chosen file is copied into the folder "picked" of the origin-private file
 * system (navigator.storage.getDirectory(), WHATWG File System Standard) and that file's
 * handle is handed out: the same kind of FileSystemFileHandle a picked file has, kept and
 * read again by the app as such. Changing a file "on disk" then means changing its copy
 * there. Not exercised: the picker dialog, and the browser's prompt for leave to read a
 * kept file again (handles of the origin-private file system always have leave).
 */
export function handlesThroughFileInput(): void {
  (window as unknown as { showOpenFilePicker: (o?: { multiple?: boolean }) => Promise<FileSystemFileHandle[]> }).showOpenFilePicker = (options) => {
    const input = document.createElement('input');
    input.type = 'file';
    input.multiple = options?.multiple === true;
    const chosen = new Promise<File[]>((resolve) => {
      input.addEventListener('change', () => resolve(Array.from(input.files ?? [])), { once: true });
      input.addEventListener('cancel', () => resolve([]), { once: true });
    });
    input.click(); // at once, while the click that asked still counts
    return chosen.then(async (files) => {
      if (files.length === 0) throw new DOMException('The user aborted a request.', 'AbortError');
      const folder = await (await navigator.storage.getDirectory()).getDirectoryHandle('picked', { create: true });
      return Promise.all(files.map(async (file) => {
        const handle = await folder.getFileHandle(file.name, { create: true });
        const writable = await handle.createWritable();
        await writable.write(file);
        await writable.close();
        return handle;
      }));
    });
  };
}

/** The page has no showOpenFilePicker, as in a browser without the File System Access API: files are picked through a file input. */
export function noFilePicker(): void {
  Object.defineProperty(window, 'showOpenFilePicker', { value: undefined, configurable: true });
}
