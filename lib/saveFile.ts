/** Hands a downloaded file to the browser's save dialog (web only). */
export function saveBlob(blob: Blob, fileName: string): void {
  if (typeof document === 'undefined') return;
  const url = URL.createObjectURL(blob);
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** The file name a Content-Disposition header proposes, or a fallback. */
export function fileNameFrom(headers: Headers, fallback: string): string {
  return /filename="([^"]+)"/.exec(headers.get('Content-Disposition') ?? '')?.[1] ?? fallback;
}
