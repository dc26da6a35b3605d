/** A file size as people read it: KB under a megabyte, else MB with one decimal below 10 MB. */
export function fileSize(bytes: number): string {
  if (bytes < 1048576) return `${Math.max(1, Math.round(bytes / 1024))} KB`;
  return `${(bytes / 1048576).toFixed(bytes < 10 * 1048576 ? 1 : 0)} MB`;
}
