/** Hands a file to the user through the browser's download (works in Electron and the web host). */
export function saveDownload(fileName: string, content: Blob | string): void {
  const url = typeof content === 'string' ? content : URL.createObjectURL(content);
  const anchor = document.createElement('a');
  anchor.href = url;
  anchor.download = fileName.replace(/[\\/:*?"<>|]+/g, '-');
  document.body.append(anchor);
  anchor.click();
  anchor.remove();
  if (typeof content !== 'string') setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
