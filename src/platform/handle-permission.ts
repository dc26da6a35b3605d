// The File System Access API's leave to use a handle again (WICG File System Access,
// FileSystemHandle.queryPermission / requestPermission). A handle kept from an earlier
// visit usually needs the user's leave again; asking shows the browser's own prompt and
// is refused unless it happens while handling a click.

export type HandlePermission = 'granted' | 'denied' | 'prompt';

interface PermissionMethods {
  queryPermission?(descriptor: { mode: 'read' | 'readwrite' }): Promise<HandlePermission>;
  requestPermission?(descriptor: { mode: 'read' | 'readwrite' }): Promise<HandlePermission>;
}

/** Where leave stands ('query'), or asks for it ('request'); a failed call reads as not given. */
export async function handlePermission(handle: FileSystemHandle, how: 'query' | 'request', mode: 'read' | 'readwrite'): Promise<HandlePermission> {
  const methods = handle as FileSystemHandle & PermissionMethods;
  const call = how === 'query' ? methods.queryPermission : methods.requestPermission;
  if (!call) return 'granted'; // a browser without the permission methods gives handles their access outright
  try {
    return await call.call(handle, { mode });
  } catch {
    return how === 'query' ? 'prompt' : 'denied'; // e.g. a request without a click
  }
}
